package plot

// Style is how one series looks. Marker, dash and hatch carry its meaning
// as well as the colour, so a chart reads in black and white.
type Style struct {
	Colour string // stroke and fill colour
	Marker string // "circle", "square", "triangle", "diamond", "cross", "plus" or "" for none
	Open   bool   // marker drawn as an outline
	Dash   string // stroke-dasharray of lines; "" for solid
	Hatch  string // fill of boxes and bars: "solid", "diagonal", "dots", "cross", "horizontal", "back"
}

// Styles are the page's series styles, in order of use.
var Styles = []Style{
	{Colour: "#1f3b57", Marker: "circle", Hatch: "solid", Dash: ""},
	{Colour: "#9a5b13", Marker: "square", Open: true, Hatch: "diagonal", Dash: "6 3"},
	{Colour: "#3f6f3a", Marker: "triangle", Hatch: "dots", Dash: "2 3"},
	{Colour: "#7a2e4b", Marker: "diamond", Open: true, Hatch: "cross", Dash: "8 3 2 3"},
	{Colour: "#555555", Marker: "cross", Hatch: "horizontal", Dash: "1 2"},
	{Colour: "#2f6f8f", Marker: "plus", Hatch: "back", Dash: "10 4"},
}

// StyleN returns style i, cycling.
func StyleN(i int) Style {
	if i < 0 {
		i = -i
	}
	return Styles[i%len(Styles)]
}
