package notebook

import (
	"slices"
	"strings"
)

// A Descriptor says everything the engine, the command line and the page
// know about a kind of cell besides its computation's code: its label, the
// inputs it reads, whether it holds a data table, its settings (type,
// default, allowed values with labels, unit and help, through the settings
// struct New returns and the maps here), the tables it outputs and the
// headline figures it gives, in rank. Validation, SCHEMA.md's test, `lixiv
// kinds` and the page's choice lists all read the descriptors, so adding a
// kind of cell is one calc file and one call of Describe.
type Descriptor struct {
	Kind  Kind
	Label string // the page's name for the kind, "Atmospheric input"
	// Inputs are the cells the kind reads (the roles of "uses").
	Inputs []Role
	// Table says whether cells of the kind hold a data table.
	Table bool
	// New returns the settings of a new cell, holding the documented
	// defaults.
	New func() Settings
	// Compute computes a cell of the kind (nil: registered apart with
	// Register).
	Compute ComputeFunc
	// Notes say, setting by setting, what it does and, for a setting that
	// takes one of a few words, the values it accepts: Validate refuses
	// any other, and the page offers exactly these. Keys are those of the
	// settings struct; a setting without a note takes any value of its
	// type.
	Notes []SettingNote
	// Tables are the output tables the kind can give.
	Tables []TableInfo
	// Idle reports a setting that does nothing under the cell's other
	// settings, which the page leaves out (nil: none ever is).
	Idle func(s Settings, key string) bool
	// ReadsTable reports whether the cell's settings read its data table
	// (nil: always); the page says so in place of an empty table.
	ReadsTable func(s Settings) bool
	// Headline ranks the cell's figures among the budget's headline
	// figures (FigureRank); the first that matches a figure ranks it.
	Headline []FigureInfo
}

// SettingNote is what a descriptor says of one setting.
type SettingNote struct {
	Key     string
	Help    string   // what the setting does, in a phrase
	Choices []Choice // the values accepted; nil for any value of its type
}

// Choice is one value a setting accepts.
type Choice struct {
	Value string // as stored in the file
	Label string // as the page offers it; "" for Value itself
}

// Text is what the page shows for the choice.
func (c Choice) Text() string {
	if c.Label == "" {
		return c.Value
	}
	return c.Label
}

// TableInfo describes an output table.
type TableInfo struct {
	Name    string       // short key, used in chart references ("daily")
	Columns []ColumnInfo // the fixed columns, in display order
	// Open says that the table has further columns named by the data (one
	// per mineral, one per source and cation, …).
	Open bool
	// Labels are the page's labels, without unit, of the columns whose
	// name does not read well ("Na_atm_share": "atmospheric share of Na");
	// ColumnLabel labels the others by rule. A list, not a map, so that it
	// costs the page no start-up code.
	Labels []LabelInfo
}

// LabelInfo is the page's label of one output column.
type LabelInfo struct {
	Column string // the column's name
	Label  string // its label, without unit
}

// Label returns the label of column name, "" when the table gives none.
func (t *TableInfo) Label(name string) string {
	for _, l := range t.Labels {
		if l.Column == name {
			return l.Label
		}
	}
	return ""
}

// ColumnInfo describes a column of an output table.
type ColumnInfo struct {
	Name string // such as "discharge"
	Unit string // such as "m³/s"; "" for labels, counts and ratios
}

// FigureInfo describes a headline figure the summary strip may show.
type FigureInfo struct {
	Name string // the figure's name, or its start when Prefix is set
	Unit string // its unit; "" for any
	// Prefix matches every figure whose name starts with Name.
	Prefix bool
	// Rank orders the headline figures of the whole budget: lower first.
	Rank int
}

// Unranked is the rank of a figure no descriptor ranks.
const Unranked = 10

// FigureRank returns the rank of figure name of a cell of kind k in the
// budget's headline figures (Unranked when its descriptor does not rank
// it).
func FigureRank(k Kind, name string) int {
	if d := descriptors[k]; d != nil {
		for _, f := range d.Headline {
			if f.Name == name || f.Prefix && strings.HasPrefix(name, f.Name) {
				return f.Rank
			}
		}
	}
	return Unranked
}

// Setting describes one setting of a kind, as the page and `lixiv kinds`
// show it.
type Setting struct {
	Key     string   // JSON key, such as "area_km2"
	Label   string   // the page's label, with its unit (SettingLabel)
	Type    string   // "number", "integer", "text", "yes/no" or "list"
	Default string   // the default as text
	Blank   string   // what an empty field means, "" when it must hold a value
	Choices []Choice // the values accepted, nil for any of the type
	Help    string   // what the setting does
}

var (
	descriptors = map[Kind]*Descriptor{}
	// Kinds lists every kind a user can add, in the usual document order
	// (the order of Describe).
	Kinds []Kind
)

// Describe registers the descriptor of a kind of cell, replacing any
// earlier one of that kind, and returns a function that removes it again
// (for tests). It is meant for setup code and tests, not for concurrent
// use.
func Describe(d Descriptor) (remove func()) {
	old, had := descriptors[d.Kind]
	oldCompute, hadCompute := computers[d.Kind]
	dd := d
	descriptors[d.Kind] = &dd
	if !had {
		Kinds = append(Kinds, d.Kind)
	}
	if d.Compute != nil {
		computers[d.Kind] = d.Compute
	}
	return func() {
		if had {
			descriptors[d.Kind] = old
		} else {
			delete(descriptors, d.Kind)
			Kinds = slices.DeleteFunc(Kinds, func(k Kind) bool { return k == d.Kind })
		}
		if hadCompute {
			computers[d.Kind] = oldCompute
		} else {
			delete(computers, d.Kind)
		}
	}
}

// DescriptorOf returns the descriptor of kind k, or nil for a kind no
// descriptor names (a broken cell's).
func DescriptorOf(k Kind) *Descriptor { return descriptors[k] }

// Settings lists the kind's settings in their declared order.
func (d *Descriptor) Settings() []Setting {
	var out []Setting
	for _, p := range Params(d.New()) {
		out = append(out, Setting{Key: p.Key, Label: SettingLabel(p.Key), Type: p.Type, Default: p.Value, Blank: p.Blank,
			Choices: d.note(p.Key).Choices, Help: d.note(p.Key).Help})
	}
	return out
}

// note returns the note on the setting key (empty when there is none).
func (d *Descriptor) note(key string) SettingNote {
	for _, n := range d.Notes {
		if n.Key == key {
			return n
		}
	}
	return SettingNote{}
}

// Choices returns the values the setting key accepts, nil when it takes
// any value of its type.
func (d *Descriptor) Choices(key string) []Choice { return d.note(key).Choices }

// Accepts reports whether the setting key takes value: any value when
// the kind lists no choices for it.
func (d *Descriptor) Accepts(key, value string) bool {
	cs := d.Choices(key)
	if cs == nil {
		return true
	}
	for _, c := range cs {
		if c.Value == value {
			return true
		}
	}
	return false
}

// checkChoices refuses a setting of s whose value is not one of its
// kind's choices.
func checkChoices(s Settings) error {
	d := descriptors[s.Kind()]
	if d == nil {
		return nil
	}
	for _, p := range Params(s) {
		if !d.Accepts(p.Key, p.Value) {
			return settingErr(p.Key, "%q is not one of %q", p.Value, values(d.Choices(p.Key)))
		}
	}
	return nil
}

// validate checks s's ranges, then its kind's choices.
func validate(s Settings) error {
	if err := s.Validate(); err != nil {
		return err
	}
	return checkChoices(s)
}

func values(cs []Choice) []string {
	out := make([]string, len(cs))
	for i, c := range cs {
		out[i] = c.Value
	}
	return out
}

// Idle reports whether the setting key of s does nothing under s's other
// settings (its descriptor's Idle).
func Idle(s Settings, key string) bool {
	d := descriptors[s.Kind()]
	return d != nil && d.Idle != nil && d.Idle(s, key)
}

// ReadsTable reports whether a cell with settings s reads its data table
// (its descriptor's ReadsTable; a kind without a table reads none).
func ReadsTable(s Settings) bool {
	d := descriptors[s.Kind()]
	return d != nil && d.Table && (d.ReadsTable == nil || d.ReadsTable(s))
}
