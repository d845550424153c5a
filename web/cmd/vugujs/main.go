// Command vugujs writes vugu's renderer helper script (the constant
// jsHelperScript of vugu's domrender package) to standard output, so that
// the page can load it as a file. The page's content security policy
// forbids eval, which is how the renderer would otherwise install it.
//
// Usage: vugujs <path to domrender/renderer-js-script.go>
package main

import (
	"errors"
	"fmt"
	"go/ast"
	"go/parser"
	"go/token"
	"os"
	"strconv"
)

func main() {
	if len(os.Args) != 2 {
		fmt.Fprintln(os.Stderr, "usage: vugujs renderer-js-script.go")
		os.Exit(2)
	}
	s, err := helperScript(os.Args[1])
	if err != nil {
		fmt.Fprintln(os.Stderr, "vugujs:", err)
		os.Exit(1)
	}
	fmt.Print(s)
}

// helperScript returns the value of the string constant jsHelperScript
// declared in the Go file at path.
func helperScript(path string) (string, error) {
	f, err := parser.ParseFile(token.NewFileSet(), path, nil, 0)
	if err != nil {
		return "", err
	}
	for _, d := range f.Decls {
		g, ok := d.(*ast.GenDecl)
		if !ok || g.Tok != token.CONST {
			continue
		}
		for _, sp := range g.Specs {
			v := sp.(*ast.ValueSpec)
			for i, n := range v.Names {
				if n.Name != "jsHelperScript" || i >= len(v.Values) {
					continue
				}
				lit, ok := v.Values[i].(*ast.BasicLit)
				if !ok || lit.Kind != token.STRING {
					return "", errors.New("jsHelperScript is not a string literal")
				}
				return strconv.Unquote(lit.Value)
			}
		}
	}
	return "", errors.New("no jsHelperScript constant in " + path)
}
