package sweep

import (
	"strconv"
	"strings"
	"testing"
)

// TestParseGrid reads --grid ranges with --points counts. The expected
// axes are worked by hand (common practice): n values from lo to hi
// inclusive, a named count winning over the count for every axis.
func TestParseGrid(t *testing.T) {
	cases := []struct {
		name           string
		ranges, points []string
		want           string // "name lo hi n" per axis, or the error's text
	}{
		{"one count for all", []string{"r=0..30", "b=1/2..3"}, []string{"61"}, "r 0 30 61; b 1/2 3 61"},
		{"named counts", []string{"r=0..30", "b=1/2..3"}, []string{"r=61", "b=6"}, "r 0 30 61; b 1/2 3 6"},
		{"named wins", []string{"r=0..30", "b=1/2..3"}, []string{"5", "b=6"}, "r 0 30 5; b 1/2 3 6"},
		{"decimals and negatives", []string{"r=-1.5..-0.25"}, []string{"2"}, "r -3/2 -1/4 2"},
		{"one point", []string{"r=5..5"}, []string{"1"}, "r 5 5 1"},
		{"old three-colon form", []string{"r=0:30:61"}, nil, "error: --grid r=0..30 --points r=61"},
		{"old two-colon form", []string{"r=0:30"}, []string{"5"}, "error: --grid r=LO..HI --points r=N"},
		{"no count", []string{"r=0..30"}, nil, "error: how many points? give --points N (every axis) or --points r=N"},
		{"count for no axis", []string{"r=0..30"}, []string{"5", "b=3"}, "error: --points b: no --grid b=LO..HI"},
		{"count twice", []string{"r=0..30"}, []string{"r=5", "r=6"}, "error: --points r: given twice"},
		{"count zero", []string{"r=0..30"}, []string{"0"}, "error: --points \"0\""},
		{"range in --points", []string{"r=0..30"}, []string{"r=0..3"}, "error: the range goes to --grid"},
		{"reversed", []string{"r=3..1"}, []string{"5"}, "error: 5 points need LO < HI"},
		{"three dots", []string{"r=1...5"}, []string{"5"}, "error: expected NAME=LO..HI"},
		{"two ranges", []string{"r=1..2..3"}, []string{"5"}, "error: expected NAME=LO..HI"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			g, err := ParseGrid(c.ranges, c.points)
			var got string
			if err != nil {
				got = "error: " + err.Error()
			} else {
				var parts []string
				for _, a := range g {
					parts = append(parts, a.Name+" "+a.Lo.RatString()+" "+a.Hi.RatString()+" "+itoa(a.N))
				}
				got = strings.Join(parts, "; ")
			}
			if strings.HasPrefix(c.want, "error: ") {
				if err == nil || !strings.Contains(got, strings.TrimPrefix(c.want, "error: ")) {
					t.Errorf("got %q, want an error with %q", got, c.want)
				}
				return
			}
			if got != c.want {
				t.Errorf("got %q, want %q", got, c.want)
			}
		})
	}
}

func itoa(n int) string { return strconv.Itoa(n) }
