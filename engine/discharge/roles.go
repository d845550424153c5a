package discharge

// Roles says what Read takes each column of a header row as: "date",
// "time of day", "discharge", "unit" (a per-row unit column), or "" for a
// column it does not use. A header row that Read would take as the first
// data row (its first cell a date) gives the roles of a table without
// names.
func Roles(header []string) []string {
	c := findColumns(header)
	out := make([]string, len(header))
	for i := range out {
		switch i {
		case c.date:
			out[i] = "date"
		case c.time:
			out[i] = "time of day"
		case c.q:
			out[i] = "discharge"
		case c.unitCol:
			out[i] = "unit"
		}
	}
	return out
}
