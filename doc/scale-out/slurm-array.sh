#!/bin/bash
# rootshift on a Slurm job array: each array task analyses one shard of the
# input (a stable hash of the series id), then one merge job joins the parts
# in input order and checks that every series came back exactly once.
#
#   jobid=$(sbatch --parsable doc/scale-out/slurm-array.sh)
#   sbatch --dependency=afterany:$jobid --wrap \
#     'rootshift batch merge parts/part-*.jsonl -o results.jsonl'
#
# A task that is killed (time limit, preemption) can be requeued as is:
# --resume keeps its whole records and runs the rest.
#SBATCH --job-name=rootshift-batch
#SBATCH --array=1-8
#SBATCH --cpus-per-task=2
#SBATCH --mem=1G
#SBATCH --time=02:00:00
#SBATCH --output=rootshift-%A_%a.log
set -uo pipefail

INPUT=${INPUT:-data/series}   # a directory of CSV files, or one file
OUT=${OUT:-parts}
mkdir -p "$OUT"

# --shard auto reads SLURM_ARRAY_TASK_ID with SLURM_ARRAY_TASK_MIN/MAX (or
# SLURM_ARRAY_TASK_COUNT): this task is shard ID of the array's size.
rootshift batch --shard auto -j "${SLURM_CPUS_PER_TASK:-2}" --resume --quiet \
  -o "$OUT/part-${SLURM_ARRAY_TASK_ID}.jsonl" "$INPUT"
status=$?
# Exit status 1 means some series failed (their records say why): the part
# is complete. Anything else is an error of the task.
if [ "$status" -eq 1 ]; then status=0; fi
exit "$status"
