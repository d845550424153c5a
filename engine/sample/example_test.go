package sample_test

import (
	"fmt"
	"os"

	"lixiv/engine/chem"
	"lixiv/engine/sample"
)

// Cells pasted from a spreadsheet: tab-separated, decimal commas, a value
// below detection and a negative value that is reported, not loaded. The
// printed µmol/L follow from the IUPAC/CIAAW 2021 standard atomic weights
// (Prohaska et al. 2022): 2.35 mg/L Ca / 40.078 g/mol = 58.64 µmol/L,
// 0.21 mg/L NO3-N / 14.007 g/mol = 14.993 µmol/L, and 9.8 mg/L as CaCO3 /
// 50.043 g/eq = 195.8 µeq/L.
func ExampleParseText() {
	text := "Sample\tDate\tCa (mg/L)\tNO3-N (mg/L)\tAlk (mg/L CaCO3)\n" +
		"CV-01\t2024-03-05\t2,35\t0,21\t9,8\n" +
		"CV-02\t2024-04-10\t-1\t<0,02\t12,6\n"
	t := sample.ParseText(text, "pasted", sample.Options{})
	for _, s := range t.Samples {
		lim, censored := s.Limit(chem.NO3)
		fmt.Printf("%s %s Ca %.2f NO3 %.3f (below %.3f: %v) Alk %.1f µeq/L\n",
			s.ID, s.Time.Format("2006-01-02"), s.C[chem.Ca], s.C[chem.NO3], lim, censored, s.C[chem.Alk])
	}
	for _, p := range t.Problems {
		fmt.Println(p)
	}
	// Output:
	// CV-01 2024-03-05 Ca 58.64 NO3 14.993 (below 0.000: false) Alk 195.8 µeq/L
	// CV-02 2024-04-10 Ca NaN NO3 0.714 (below 1.428: true) Alk 251.8 µeq/L
	// pasted:3:3 (Ca (mg/L)): "-1": negative value; a concentration cannot be negative; left missing
}

// Read a file, then write it back normalised to µmol/L.
func ExampleRead() {
	f, err := os.Open("../../testdata/samples-messy.csv")
	if err != nil {
		fmt.Println(err)
		return
	}
	defer f.Close()
	t, err := sample.Read(f, "samples-messy.csv", sample.Options{Policy: sample.HalfLimit})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println(len(t.Samples), "samples,", len(t.Problems), "problems")
	for _, c := range t.Columns[9:12] {
		fmt.Println(c.Header, "->", c.Mapping())
	}
	t.Samples = t.Samples[:1]
	t.WriteCSV(os.Stdout)
	// Output:
	// 8 samples, 2 problems
	// Na -> Na, mg/L -> µmol/L
	// K -> K, mg/L -> µmol/L
	// Ca -> Ca, mg/L -> µmol/L
	// Sample,Site,Date,Q (m3/s),pH,Temperature (°C),EC (µS/cm),87Sr/86Sr,Na (µmol/L),K (µmol/L),Ca (µmol/L),Mg (µmol/L),Sr (µmol/L),Cl (µmol/L),SO4 (µmol/L),NO3 (µmol/L),Alk (µeq/L),SiO2 (µmol/L),pH_lab
	// CV-01,Corrie Vale burn,2024-01-14T10:15:00Z,0.0852,6.82,3.1,48.5,0.72135,179.21014995066534,10.742155029758326,58.63566046209891,36.20654186381403,0.1380963250399452,158.2,35.4,14.992503748125936,195.83158483704017,107.35149709568431,7.05
}

// Read the first sheet of a workbook; problems name the spreadsheet row
// and column.
func ExampleReadXLSX() {
	b, err := os.ReadFile("testdata/corrie-vale.xlsx")
	if err != nil {
		fmt.Println(err)
		return
	}
	sheets, _ := sample.Sheets(b)
	fmt.Println("sheets:", sheets)
	t, err := sample.ReadXLSX(b, "corrie-vale.xlsx", "", sample.Options{})
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, s := range t.Samples {
		fmt.Printf("row %d %s %s Ca %.2f µmol/L\n", s.Line, s.ID, s.Time.Format("2006-01-02 15:04"), s.C[chem.Ca])
	}
	for _, p := range t.Problems {
		fmt.Println(p)
	}
	if _, err := sample.ReadXLSX(b, "corrie-vale.xlsx", "Chemistry", sample.Options{}); err != nil {
		fmt.Println(err)
	}
	// Output:
	// sheets: [Samples Field notes]
	// row 3 CV-01 2024-03-05 10:30 Ca 112.28 µmol/L
	// row 4 CV-02 2024-03-19 11:31 Ca 127.25 µmol/L
	// row 6 CV-03 2024-04-02 00:00 Ca NaN µmol/L
	// corrie-vale.xlsx:6:4 (Ca (mg/L)): "high": not a number; left missing; write a number, a value below detection such as "<0.05", or leave the cell blank
	// corrie-vale.xlsx:6:5 (Na (mg/L)): "-1": negative value; a concentration cannot be negative; left missing
	// corrie-vale.xlsx: no such sheet; sheet "Chemistry" is not in the workbook, which holds "Samples", "Field notes"
}
