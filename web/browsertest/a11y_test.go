//go:build browser

package browsertest

import (
	"context"
	"encoding/json"
	"strings"
	"testing"

	"github.com/chromedp/cdproto/accessibility"
	"github.com/chromedp/chromedp"
)

// controlRoles are the roles of the page's controls in Chromium's
// accessibility tree.
var controlRoles = map[string]bool{
	"button": true, "textbox": true, "combobox": true, "checkbox": true, "link": true, "spinbutton": true,
	"listbox": true, "radio": true, "searchbox": true, "slider": true, "switch": true, "tab": true, "menuitem": true,
}

// axProblems reads the page's accessibility tree as Chromium gives it to
// a screen reader and returns every control without a name, and every
// name two controls of one cell share.
func axProblems(t testing.TB, ctx context.Context) (controls int, problems []string) {
	t.Helper()
	tree, err := chromedp.Call(ctx, accessibility.GetFullAXTree, accessibility.GetFullAXTreeParams{})
	if err != nil {
		t.Fatal(err)
	}
	byID := map[accessibility.NodeID]*accessibility.Node{}
	for _, n := range tree.Nodes {
		byID[n.NodeID] = n
	}
	str := func(v *accessibility.Value) string {
		if v == nil || len(v.Value) == 0 {
			return ""
		}
		var s string
		if json.Unmarshal(v.Value, &s) != nil {
			return ""
		}
		return strings.TrimSpace(s)
	}
	// cellOf names the cell (a named region) a node sits in, "" outside cells.
	cellOf := func(n *accessibility.Node) string {
		for p := byID[n.ParentID]; p != nil; p = byID[p.ParentID] {
			if str(p.Role) == "region" && str(p.Name) != "" {
				return str(p.Name) + "#" + string(p.NodeID)
			}
		}
		return ""
	}
	seen := map[string]int{}
	for _, n := range tree.Nodes {
		role := str(n.Role)
		if n.Ignored || !controlRoles[role] {
			continue
		}
		controls++
		name := str(n.Name)
		if name == "" {
			problems = append(problems, "a "+role+" without a name (value "+str(n.Value)+")")
			continue
		}
		if cell := cellOf(n); cell != "" {
			key := cell + "\x00" + name
			if seen[key]++; seen[key] == 2 {
				problems = append(problems, "two controls named "+name+" in the cell "+strings.Split(cell, "#")[0])
			}
		}
	}
	return controls, problems
}

// TestAccessibleNames checks the demo and a new budget holding a file:
// every control has a name, and none shares it with another of its cell.
func TestAccessibleNames(t *testing.T) {
	ctx := openDemo(t)
	check := func(when string) {
		t.Helper()
		n, problems := axProblems(t, ctx)
		if n < 50 {
			t.Errorf("%s: only %d controls in the accessibility tree", when, n)
		}
		for _, p := range problems {
			t.Errorf("%s: %s", when, p)
		}
		t.Logf("%s: %d controls", when, n)
	}
	check("the demo")
	newBudget(t, ctx)
	check("a new budget")
	openTable(t, ctx, sallowmere("sallowmere-samples.csv"), "Samples")
	check("a new budget with samples")
}

// TestTabStops counts the tab stops from the top of the demo to the flux
// estimator, and checks that the skip link and the jump list come first.
func TestTabStops(t *testing.T) {
	ctx := openDemo(t)
	order := eval[[]string](t, ctx, `(() => {
		const all = [...document.querySelectorAll("a[href], button, input, select, textarea, [tabindex]")]
			.filter(e => e.tabIndex >= 0 && !e.disabled && e.offsetParent !== null || e.id === "file-open");
		return all.map(e => e.id || e.textContent.trim().slice(0, 30) || e.getAttribute("aria-label") || e.tagName);
	})()`)
	if len(order) == 0 || order[0] != "Skip to the cells" {
		t.Errorf("first tab stop: got %v, want the skip link", order[:min(3, len(order))])
	}
	at := -1
	for i, id := range order {
		if strings.HasSuffix(id, "-estimator") {
			at = i + 1
		}
	}
	if at < 0 || at > 200 {
		t.Errorf("the flux estimator is tab stop %d of %d, want it within 200", at, len(order))
	}
	t.Logf("the flux estimator is tab stop %d of %d", at, len(order))
}
