package discharge

import (
	"errors"
	"math"
	"testing"
)

func nan() float64 { return math.NaN() }

func TestGapsAndFill(t *testing.T) {
	r := NewRecord("t", Date(2021, 1, 1), []float64{nan(), 1, nan(), nan(), 4, nan(), nan(), nan(), nan(), 9, nan()})
	gaps := r.Gaps()
	want := []Span{
		{Date(2021, 1, 1), Date(2021, 1, 1)},
		{Date(2021, 1, 3), Date(2021, 1, 4)},
		{Date(2021, 1, 6), Date(2021, 1, 9)},
		{Date(2021, 1, 11), Date(2021, 1, 11)},
	}
	if len(gaps) != len(want) {
		t.Fatalf("got gaps %v, want %v", gaps, want)
	}
	for i := range want {
		if gaps[i] != want[i] {
			t.Errorf("gap %d: got %v, want %v", i, gaps[i], want[i])
		}
	}
	if got := gaps[1].String(); got != "2021-01-03 to 2021-01-04 (2 days)" {
		t.Errorf("span text %q", got)
	}
	tests := []struct {
		name   string
		method FillMethod
		max    int
		q      []float64
		filled int
		left   int
	}{
		{"no fill", NoFill, 10, []float64{nan(), 1, nan(), nan(), 4, nan(), nan(), nan(), nan(), 9, nan()}, 0, 4},
		{"linear up to 2 days", FillLinear, 2, []float64{nan(), 1, 2, 3, 4, nan(), nan(), nan(), nan(), 9, nan()}, 2, 3},
		{"linear up to 4 days", FillLinear, 4, []float64{nan(), 1, 2, 3, 4, 5, 6, 7, 8, 9, nan()}, 6, 2},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			f, rep := r.Fill(tt.method, tt.max)
			for i, w := range tt.q {
				g := f.Q[i]
				if math.IsNaN(w) != math.IsNaN(g) || !math.IsNaN(w) && math.Abs(g-w) > 1e-12 {
					t.Errorf("day %d: got %g, want %g", i, g, w)
				}
				if f.Filled[i] != (math.IsNaN(r.Q[i]) && !math.IsNaN(w)) {
					t.Errorf("day %d: Filled = %v", i, f.Filled[i])
				}
			}
			if rep.Days != tt.filled || len(rep.Left) != tt.left {
				t.Errorf("report: %d days filled, %d gaps left; want %d, %d", rep.Days, len(rep.Left), tt.filled, tt.left)
			}
			if !math.IsNaN(r.Q[2]) {
				t.Error("Fill modified its receiver")
			}
		})
	}
}

func TestAt(t *testing.T) {
	r := NewRecord("t", Date(2021, 1, 1), []float64{1, nan(), 3})
	if q, err := r.At(Date(2021, 1, 3)); err != nil || q != 3 {
		t.Errorf("At(2021-01-03) = %g, %v; want 3", q, err)
	}
	_, err := r.At(Date(2021, 1, 2))
	if !errors.Is(err, ErrGap) || err.Error() != "2021-01-02: no discharge on that day (gap)" {
		t.Errorf("gap day: got %v", err)
	}
	_, err = r.At(Date(2020, 12, 31))
	if !errors.Is(err, ErrOutside) || err.Error() != "2020-12-31: date outside the discharge record (2021-01-01 to 2021-01-03)" {
		t.Errorf("outside: got %v", err)
	}
}

func TestWaterYear(t *testing.T) {
	// A water year starting in October is labelled by the calendar year in
	// which it ends (common practice, e.g. the 1 Oct - 30 Sep year).
	tests := []struct {
		d     Day
		first int
		want  int
	}{
		{Date(2020, 9, 30), 10, 2020},
		{Date(2020, 10, 1), 10, 2021},
		{Date(2021, 9, 30), 10, 2021},
		{Date(2021, 12, 31), 1, 2021},
		{Date(2021, 12, 31), 0, 2021},
		{Date(2021, 3, 31), 4, 2021},
		{Date(2021, 4, 1), 4, 2022},
	}
	for _, tt := range tests {
		if got := YearOf(tt.d, tt.first); got != tt.want {
			t.Errorf("YearOf(%s, %d) = %d, want %d", tt.d, tt.first, got, tt.want)
		}
	}
	// A record from 2020-10-01 to 2022-09-30 is exactly two water years
	// (Oct-Sep) but touches three calendar years.
	n := int(Date(2022, 10, 1) - Date(2020, 10, 1))
	q := make([]float64, n)
	for i := range q {
		q[i] = 1
	}
	r := NewRecord("t", Date(2020, 10, 1), q)
	wy := r.Years(10)
	if len(wy) != 2 {
		t.Fatalf("got %d water years, want 2", len(wy))
	}
	if wy[0].String() != "2020-10/2021-09" || wy[0].Label != 2021 || wy[0].Days != 365 || !wy[0].Complete() {
		t.Errorf("first water year %+v (%s)", wy[0], wy[0])
	}
	if wy[1].Start != Date(2021, 10, 1) || wy[1].End != Date(2022, 9, 30) || !wy[1].Complete() {
		t.Errorf("second water year %+v", wy[1])
	}
	cy := r.Years(1)
	if len(cy) != 3 || cy[0].Complete() || !cy[1].Complete() || cy[2].Complete() || cy[0].WithData != 92 {
		t.Errorf("calendar years %+v", cy)
	}
	// Leap water year 2023-10 to 2024-09 has 366 days.
	s, e := YearBounds(2024, 10)
	if int(e-s)+1 != 366 {
		t.Errorf("water year 2024 has %d days, want 366", int(e-s)+1)
	}
}

func TestRunoff(t *testing.T) {
	tests := []struct {
		name string
		q    float64
		days int
		area float64
		want float64
	}{
		{"docs/methods.md §13 item 10", 1, 365, 100, 315.36}, // R = Q × 31536 / A (docs/methods.md §8.5)
		{"docs/methods.md §13 item 9", 2, 365, 250, 252.288}, // docs/methods.md §13 item 9
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			q := make([]float64, tt.days)
			for i := range q {
				q[i] = tt.q
			}
			r := NewRecord("t", Date(2021, 1, 1), q)
			got, n := r.Runoff(Date(2021, 1, 1), Date(2021, 12, 31), tt.area)
			if n != tt.days || math.Abs(got-tt.want) > 1e-9*tt.want {
				t.Errorf("got %.10g mm over %d days, want %.10g over %d (tolerance 1e-9 relative)", got, n, tt.want, tt.days)
			}
		})
	}
}

func TestExceedance(t *testing.T) {
	q := make([]float64, 101)
	for i := range q {
		q[i] = float64(i)
	}
	q[100] = nan() // 0..99 with one gap
	r := NewRecord("t", Date(2021, 1, 1), q)
	tests := []struct{ q, want float64 }{{90, 0.10}, {0, 1}, {99.5, 0}, {50, 0.5}} // counting days, common practice
	for _, tt := range tests {
		if got := r.Exceedance(tt.q); math.Abs(got-tt.want) > 1e-15 {
			t.Errorf("Exceedance(%g) = %g, want %g", tt.q, got, tt.want)
		}
	}
}
