package main

import (
	"bufio"
	"flag"
	"fmt"
	"math/rand/v2"
	"os"
	"strconv"
)

func main() {
	n := flag.Int("n", 10000, "number of series")
	T := flag.Int("t", 300, "length of each series")
	seed := flag.Uint64("seed", 1, "seed")
	flag.Parse()
	w := bufio.NewWriterSize(os.Stdout, 1<<20)
	defer w.Flush()
	r := rand.New(rand.NewPCG(*seed, 0))
	buf := make([]byte, 0, 16)
	for k := 0; k < *n; k++ {
		fmt.Fprintf(w, `{"id":"s%05d","values":[`, k)
		s, u := 0.0, 0.0
		for i := 0; i < *T; i++ {
			e := r.NormFloat64()
			s += e
			u = 0.5*u + e
			v := s
			if k%2 == 1 {
				v = u
			}
			if i > 0 {
				w.WriteByte(',')
			}
			buf = strconv.AppendFloat(buf[:0], 100+v, 'f', 4, 64)
			w.Write(buf)
		}
		w.WriteString("]}\n")
	}
}
