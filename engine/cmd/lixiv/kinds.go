package main

import (
	"fmt"
	"io"
	"strings"

	"lixiv/engine/notebook"
)

// runKinds lists the kinds of cell a budget may hold, as their descriptors
// say: inputs, settings with their defaults and the values they accept,
// and output tables with their columns and units. Arguments name kinds to
// list; none lists them all.
func runKinds(args []string, stdout io.Writer) error {
	kinds := notebook.Kinds
	if len(args) > 0 {
		kinds = nil
		for _, a := range args {
			if notebook.DescriptorOf(notebook.Kind(a)) == nil {
				return usageError(fmt.Sprintf("no kind of cell %q; run lixiv kinds", a))
			}
			kinds = append(kinds, notebook.Kind(a))
		}
	}
	var b strings.Builder
	for i, k := range kinds {
		if i > 0 {
			b.WriteString("\n")
		}
		writeKind(&b, notebook.DescriptorOf(k))
	}
	_, err := io.WriteString(stdout, b.String())
	return err
}

// writeKind writes one descriptor.
func writeKind(b *strings.Builder, d *notebook.Descriptor) {
	fmt.Fprintf(b, "%s — %s", d.Kind, d.Label)
	if d.Table {
		b.WriteString("; holds a data table")
	}
	b.WriteString("\n")
	if len(d.Inputs) > 0 {
		var in []string
		for _, r := range d.Inputs {
			s := r.Name + " (" + string(r.Kind)
			if r.Optional {
				s += ", optional"
			}
			in = append(in, s+")")
		}
		fmt.Fprintf(b, "  inputs: %s\n", strings.Join(in, ", "))
	}
	for _, s := range d.Settings() {
		fmt.Fprintf(b, "  %s = %q (%s, %s)", s.Key, s.Default, s.Label, s.Type)
		if len(s.Choices) > 0 {
			var cs []string
			for _, c := range s.Choices {
				if c.Label != "" {
					cs = append(cs, fmt.Sprintf("%q (%s)", c.Value, c.Label))
				} else {
					cs = append(cs, fmt.Sprintf("%q", c.Value))
				}
			}
			fmt.Fprintf(b, ": one of %s", strings.Join(cs, ", "))
		}
		if s.Help != "" {
			b.WriteString("; " + s.Help)
		}
		b.WriteString("\n")
	}
	for _, t := range d.Tables {
		var cs []string
		for _, c := range t.Columns {
			if c.Unit != "" {
				cs = append(cs, c.Name+" ("+c.Unit+")")
			} else {
				cs = append(cs, c.Name)
			}
		}
		if t.Open {
			cs = append(cs, "…")
		}
		fmt.Fprintf(b, "  table %s: %s\n", t.Name, strings.Join(cs, ", "))
	}
}
