package problem

import (
	"errors"
	"fmt"
	"testing"
)

var errBelow = errors.New("below detection")

func TestProblemText(t *testing.T) {
	tests := []struct {
		name string
		p    Problem
		want string
	}{
		{"positioned", Problem{File: "stream.csv", Line: 5, Col: 3, Column: "Na", Value: "<0.1", Text: "half the limit used"},
			`stream.csv:5:3 (Na): "<0.1": half the limit used`},
		{"line only", Problem{File: "q.csv", Line: 9, Text: "gap"}, "q.csv:9: gap"},
		{"no place", Problem{Text: "computed without the rain"}, "computed without the rain"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			if got := tt.p.Error(); got != tt.want {
				t.Errorf("got %q, want %q", got, tt.want)
			}
		})
	}
}

// A cell's error wraps its list; errors.As finds the positioned problem
// and errors.Is its sentinel, without reading any text.
func TestListFoundByValue(t *testing.T) {
	l := List{{Cell: "samples", File: "stream.csv", Line: 5, Col: 3, Row: 2, Severity: Warning, Err: errBelow, Text: "substituted"},
		{Cell: "samples", File: "stream.csv", Line: 7, Row: 4, Severity: Error, Text: "not a number"}}
	err := fmt.Errorf("no sample could be read: %w", l.Err())
	var p *Problem
	if !errors.As(err, &p) || p.Line != 5 || p.Col != 3 || p.Row != 2 || p.Cell != "samples" {
		t.Fatalf("errors.As gave %+v", p)
	}
	if !errors.Is(err, errBelow) || l.Count(errBelow) != 1 {
		t.Error("the sentinel is not found")
	}
	if got := l.Error(); got != `stream.csv:5:3: substituted (and 1 more problems)` {
		t.Errorf("list text %q", got)
	}
	if (List{}).Err() != nil {
		t.Error("an empty list is an error")
	}
}
