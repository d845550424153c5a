package validation

import "testing"

func TestReplace(t *testing.T) {
	tests := []struct {
		name, page, body, want string
		bad                    bool
	}{
		{name: "append to empty", page: "", body: "x", want: "<!-- begin s -->\nx\n<!-- end s -->\n"},
		{name: "append after text", page: "# T\n", body: "x\n", want: "# T\n\n<!-- begin s -->\nx\n<!-- end s -->\n"},
		{name: "replace", page: "a\n<!-- begin s -->\nold\n<!-- end s -->\nb\n", body: "new", want: "a\n<!-- begin s -->\nnew\n<!-- end s -->\nb\n"},
		{name: "other section untouched", page: "<!-- begin r -->\nr\n<!-- end r -->\n", body: "x",
			want: "<!-- begin r -->\nr\n<!-- end r -->\n\n<!-- begin s -->\nx\n<!-- end s -->\n"},
		{name: "unbalanced", page: "<!-- end s -->\n<!-- begin s -->\n", body: "x", bad: true},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			got, err := Replace([]byte(tc.page), "s", tc.body)
			if tc.bad {
				if err == nil {
					t.Fatalf("got %q, want an error", got)
				}
				return
			}
			if err != nil {
				t.Fatal(err)
			}
			if string(got) != tc.want {
				t.Errorf("got %q, want %q", got, tc.want)
			}
		})
	}
}
