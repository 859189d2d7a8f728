package main

import (
	"fmt"
	"strconv"
	"strings"
)

// Environment variables read by --shard auto.
const (
	// Slurm job arrays (sbatch --array): the task's index, and either the
	// number of tasks or the smallest and largest index (and the step).
	envSlurmID    = "SLURM_ARRAY_TASK_ID"
	envSlurmCount = "SLURM_ARRAY_TASK_COUNT"
	envSlurmMin   = "SLURM_ARRAY_TASK_MIN"
	envSlurmMax   = "SLURM_ARRAY_TASK_MAX"
	envSlurmStep  = "SLURM_ARRAY_TASK_STEP"
	// Kubernetes Indexed Jobs: the completion index (from 0); the count is
	// not in the pod's environment, so it comes from --shards or from our
	// own variable, set in the manifest to spec.completions.
	envK8sIndex = "JOB_COMPLETION_INDEX"
	envShards   = "ROOTSHIFT_SHARDS"
)

// parseShard reads --shard: "i/n" or "auto" (the job array's index and
// count from the environment). It returns the 1-based shard, the count and,
// for auto, where they came from.
func parseShard(spec string, shardsFlag int, getenv func(string) string) (int, int, string, error) {
	if spec != "auto" {
		a, b, ok := strings.Cut(spec, "/")
		i, err1 := strconv.Atoi(a)
		n, err2 := strconv.Atoi(b)
		if !ok || err1 != nil || err2 != nil || n < 1 || i < 1 || i > n {
			return 0, 0, "", fmt.Errorf("--shard %q: want i/n with 1 <= i <= n, or auto", spec)
		}
		return i, n, "", nil
	}
	num := func(name string) (int, bool, error) {
		v := strings.TrimSpace(getenv(name))
		if v == "" {
			return 0, false, nil
		}
		x, err := strconv.Atoi(v)
		if err != nil {
			return 0, true, fmt.Errorf("--shard auto: %s=%q is not a whole number", name, v)
		}
		return x, true, nil
	}
	check := func(i, n int, from string) (int, int, string, error) {
		if n < 1 || i < 1 || i > n {
			return 0, 0, "", fmt.Errorf("--shard auto: %s gives shard %d of %d: want 1 <= i <= n", from, i, n)
		}
		return i, n, from, nil
	}
	if id, ok, err := num(envSlurmID); err != nil {
		return 0, 0, "", err
	} else if ok {
		count, hasCount, err := num(envSlurmCount)
		if err != nil {
			return 0, 0, "", err
		}
		lo, hasMin, err := num(envSlurmMin)
		if err != nil {
			return 0, 0, "", err
		}
		hi, hasMax, err := num(envSlurmMax)
		if err != nil {
			return 0, 0, "", err
		}
		step, hasStep, err := num(envSlurmStep)
		if err != nil {
			return 0, 0, "", err
		}
		if !hasStep || step < 1 {
			step = 1
		}
		switch {
		case hasMin && hasMax:
			if (id-lo)%step != 0 {
				return 0, 0, "", fmt.Errorf("--shard auto: %s=%d is not on the array's grid %d-%d:%d", envSlurmID, id, lo, hi, step)
			}
			return check((id-lo)/step+1, (hi-lo)/step+1, fmt.Sprintf("Slurm array task %d of %d-%d", id, lo, hi))
		case hasCount:
			// Without the bounds, indices are taken to run 0..count-1.
			return check(id+1, count, fmt.Sprintf("Slurm array task %d, %d tasks", id, count))
		}
		return 0, 0, "", fmt.Errorf("--shard auto: %s is set but neither %s nor %s/%s", envSlurmID, envSlurmCount, envSlurmMin, envSlurmMax)
	}
	if idx, ok, err := num(envK8sIndex); err != nil {
		return 0, 0, "", err
	} else if ok {
		n := shardsFlag
		from := "--shards"
		if n == 0 {
			v, has, err := num(envShards)
			if err != nil {
				return 0, 0, "", err
			}
			if !has {
				return 0, 0, "", fmt.Errorf("--shard auto: %s=%d but no count: give --shards N or set %s (the Job's completions)", envK8sIndex, idx, envShards)
			}
			n, from = v, envShards
		}
		return check(idx+1, n, fmt.Sprintf("indexed job completion index %d, %d shards from %s", idx, n, from))
	}
	return 0, 0, "", fmt.Errorf("--shard auto: no job-array variables in the environment (%s with %s or %s/%s; or %s with --shards or %s)",
		envSlurmID, envSlurmCount, envSlurmMin, envSlurmMax, envK8sIndex, envShards)
}
