package notebook

import "strings"

// SchemaGaps lists what doc, the text of SCHEMA.md, fails to document of
// the descriptors: a kind without its section, a setting, an input or a
// choice of a text setting not named in it, an output table missing from
// the outputs table.
func SchemaGaps(doc string) []string {
	var gaps []string
	for _, k := range Kinds {
		d := DescriptorOf(k)
		head := "**`" + string(k) + "`**"
		i := strings.Index(doc, head)
		if i < 0 {
			gaps = append(gaps, "no section for kind "+string(k))
			continue
		}
		sec := doc[i+len(head):]
		if j := strings.Index(sec, "**`"); j >= 0 {
			sec = sec[:j]
		}
		if j := strings.Index(sec, "\n#"); j >= 0 {
			sec = sec[:j]
		}
		for _, s := range d.Settings() {
			if !strings.Contains(sec, "`"+s.Key+"`") {
				gaps = append(gaps, string(k)+" setting "+s.Key)
			}
			if s.Type != "text" {
				continue
			}
			for _, c := range s.Choices {
				if !strings.Contains(sec, `"`+c.Value+`"`) {
					gaps = append(gaps, string(k)+" setting "+s.Key+" choice "+c.Value)
				}
			}
		}
		for _, r := range d.Inputs {
			if !strings.Contains(sec, "`"+r.Name+"`") {
				gaps = append(gaps, string(k)+" input "+r.Name)
			}
		}
		for _, t := range d.Tables {
			if !strings.Contains(doc, "| "+string(k)+" | `"+t.Name+"` |") {
				gaps = append(gaps, string(k)+" output table "+t.Name)
			}
		}
	}
	return gaps
}
