package enum_test

import (
	"fmt"

	"lixiv/engine/internal/enum"
)

type season int

var seasonNames = [...]string{"wet", "dry"}

func (s season) String() string { return enum.Name(s, seasonNames[:], "unknown") }

func ExampleName() {
	fmt.Println(season(1), season(5))
	// Output: dry unknown
}
