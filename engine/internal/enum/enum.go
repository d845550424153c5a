// Package enum names the values of the engine's small enumerations (an
// integer type with a table of names), so that each type's String is one
// line and an out-of-range value reads the same way everywhere.
package enum

// Name returns names[v], or unknown when v is not an index of names.
func Name[T ~int](v T, names []string, unknown string) string {
	if v < 0 || int(v) >= len(names) {
		return unknown
	}
	return names[v]
}
