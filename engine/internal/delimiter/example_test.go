package delimiter_test

import (
	"fmt"

	"lixiv/engine/internal/delimiter"
)

func ExampleDetect() {
	lines := [][]byte{[]byte("Datum;Abfluss (m3/s)"), []byte("30.09.2021;1,25"), []byte("01.10.2021;1,5")}
	d, ok := delimiter.Detect(lines, delimiter.AnyMark)
	fmt.Printf("%q %v\n", d, ok)
	var scratch []byte
	fmt.Printf("%q\n", delimiter.Split(lines[1], d, nil, &scratch))
	// Output:
	// ';' true
	// ["30.09.2021" "1,25"]
}
