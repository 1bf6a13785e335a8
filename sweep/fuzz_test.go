package sweep

import (
	"fmt"
	"testing"
)

// FuzzParseGridAxis reads arbitrary --grid ranges and --points counts: no
// panic, and an axis that is read has 1 ≤ N ≤ MaxGridPoints points from Lo
// to Hi (Lo < Hi when N > 1) and reads back the same from "name=lo..hi"
// and n, as ParseGrid reads it from "--grid name=lo..hi --points name=n"
// (common practice: a parser's output round-trips). Seeds:
// testdata/fuzz/FuzzParseGridAxis.
func FuzzParseGridAxis(f *testing.F) {
	f.Fuzz(func(t *testing.T, s string, n int) {
		a, err := ParseGridAxis(s, n)
		if err != nil {
			return
		}
		if a.Name == "" || a.N < 1 || a.N > MaxGridPoints || (a.N > 1 && a.Lo.Cmp(a.Hi) >= 0) {
			t.Fatalf("%q read as %+v", s, a)
		}
		if a.Value(0).Cmp(a.Lo) != 0 || (a.N > 1 && a.Value(a.N-1).Cmp(a.Hi) != 0) {
			t.Fatalf("%q: the ends of the axis are not Lo and Hi", s)
		}
		text := fmt.Sprintf("%s=%s..%s", a.Name, a.Lo.RatString(), a.Hi.RatString())
		count := fmt.Sprintf("%s=%d", a.Name, a.N)
		g, err := ParseGrid([]string{text}, []string{count})
		if err != nil || len(g) != 1 {
			t.Fatalf("%q, %d read as --grid %s --points %s, which reads back as %+v (%v)", s, n, text, count, g, err)
		}
		if b := g[0]; b.Name != a.Name || b.N != a.N || b.Lo.Cmp(a.Lo) != 0 || b.Hi.Cmp(a.Hi) != 0 {
			t.Fatalf("%q, %d read as --grid %s --points %s, which reads back as %+v", s, n, text, count, b)
		}
		if _, err := (Grid{a, a}).Size(); err != nil && a.N*a.N <= MaxGridPoints {
			t.Fatalf("a grid of %d×%d points is refused: %v", a.N, a.N, err)
		}
	})
}

// FuzzParseShard reads arbitrary --shard arguments: no panic, a shard read
// has 0 ≤ I < N and owns exactly one of N consecutive grid points, and it
// reads back the same from "i/N". Seeds: testdata/fuzz/FuzzParseShard.
func FuzzParseShard(f *testing.F) {
	f.Fuzz(func(t *testing.T, s string) {
		sh, err := ParseShard(s)
		if err != nil {
			return
		}
		if sh.N < 1 || sh.I < 0 || sh.I >= sh.N {
			t.Fatalf("%q read as %+v", s, sh)
		}
		if sh.N <= 1000 {
			owned := 0
			for k := range sh.N {
				if sh.Owns(k) {
					owned++
				}
			}
			if owned != 1 {
				t.Fatalf("%q: the shard owns %d of %d consecutive points", s, owned, sh.N)
			}
		}
		again, err := ParseShard(fmt.Sprintf("%d/%d", sh.I, sh.N))
		if err != nil || again != sh {
			t.Fatalf("%q read as %+v, which reads back as %+v (%v)", s, sh, again, err)
		}
	})
}

// FuzzReadLines reads arbitrary bytes as a sweep output and merges what is
// read: no panic, nothing allocated from an unchecked number, and a file
// that is read accounts for its bytes (Good ≤ Size) and merges with itself
// (common practice: a reader never trusts the numbers it reads). Seeds: the
// output of a small sweep, whole and cut.
func FuzzReadLines(f *testing.F) {
	whole := run(f, stableOpts(f, "s.lya", stableSrc, "a=1..5", 5))
	f.Add(whole)
	f.Add(whole[:len(whole)/2])
	f.Add([]byte(`{"index":0,"of":1000000000000}` + "\n"))
	f.Fuzz(func(t *testing.T, data []byte) {
		file, err := Read("fuzz.jsonl", data)
		if err != nil {
			return
		}
		if file.Good > file.Size || file.Of < 0 || file.Of > MaxGridPoints {
			t.Fatalf("read as Good %d of %d bytes, of %d", file.Good, file.Size, file.Of)
		}
		Merge([]*File{file, file})
	})
}
