package notebook

import (
	"fmt"
	"reflect"
	"strconv"
	"strings"
)

// Param is one setting of a cell as the page shows it: its key, its value as
// text and its type ("number", "integer", "text", "yes/no" or "list").
type Param struct {
	Key   string // JSON key, such as "area_km2"
	Value string // current value as text; lists are comma-separated
	Type  string // "number", "integer", "text", "yes/no" or "list"
	// Blank is what an empty field means for a setting that may be left
	// empty ("unknown", "not given", "needed" where the budget cannot do
	// without it), "" for the others. Such a setting holds 0 when empty,
	// and its Value is then "".
	Blank string
}

type field struct {
	key       string
	omitEmpty bool
	blank     string // the struct tag blank:"…": what an empty field means
	v         reflect.Value
}

// fields lists the settable fields of a settings struct in declaration order.
func fields(s Settings) []field {
	v := reflect.ValueOf(s).Elem()
	t := v.Type()
	out := make([]field, 0, t.NumField())
	for i := 0; i < t.NumField(); i++ {
		tag := t.Field(i).Tag.Get("json")
		if tag == "" || tag == "-" {
			continue
		}
		name, opts, _ := strings.Cut(tag, ",")
		out = append(out, field{key: name, omitEmpty: opts == "omitempty", blank: t.Field(i).Tag.Get("blank"), v: v.Field(i)})
	}
	return out
}

func fieldByKey(s Settings, key string) (field, bool) {
	for _, f := range fields(s) {
		if f.key == key {
			return f, true
		}
	}
	return field{}, false
}

// Params lists the settings of s in their declared order.
func Params(s Settings) []Param {
	var out []Param
	for _, f := range fields(s) {
		p := Param{Key: f.key, Blank: f.blank}
		switch f.v.Kind() {
		case reflect.Float64:
			p.Type, p.Value = "number", strconv.FormatFloat(f.v.Float(), 'g', -1, 64)
			if f.blank != "" && f.v.Float() == 0 {
				p.Value = ""
			}
		case reflect.Int, reflect.Int64:
			p.Type, p.Value = "integer", strconv.FormatInt(f.v.Int(), 10)
		case reflect.Bool:
			p.Type, p.Value = "yes/no", strconv.FormatBool(f.v.Bool())
		case reflect.String:
			p.Type, p.Value = "text", f.v.String()
		case reflect.Slice:
			p.Type, p.Value = "list", strings.Join(f.v.Interface().([]string), ", ")
		}
		out = append(out, p)
	}
	return out
}

// setField parses text into the field named key. It does not validate.
func setField(s Settings, key, text string) error {
	f, ok := fieldByKey(s, key)
	if !ok {
		return fmt.Errorf("%s cell has no setting %q", s.Kind(), key)
	}
	text = strings.TrimSpace(text)
	if text == "" && f.blank != "" && f.v.Kind() == reflect.Float64 {
		f.v.SetFloat(0)
		return nil
	}
	switch f.v.Kind() {
	case reflect.Float64:
		x, err := strconv.ParseFloat(strings.ReplaceAll(text, ",", "."), 64)
		if err != nil {
			return settingErr(key, "%q is not a number", text)
		}
		f.v.SetFloat(x)
	case reflect.Int, reflect.Int64:
		x, err := strconv.ParseInt(text, 10, 64)
		if err != nil {
			return settingErr(key, "%q is not a whole number", text)
		}
		if f.v.OverflowInt(x) {
			return settingErr(key, "%q is too large", text)
		}
		f.v.SetInt(x)
	case reflect.Bool:
		switch strings.ToLower(text) {
		case "true", "yes", "on", "1":
			f.v.SetBool(true)
		case "false", "no", "off", "0", "":
			f.v.SetBool(false)
		default:
			return settingErr(key, "%q is not yes or no", text)
		}
	case reflect.String:
		f.v.SetString(text)
	case reflect.Slice:
		var list []string
		for _, p := range strings.Split(text, ",") {
			if p = strings.TrimSpace(p); p != "" {
				list = append(list, p)
			}
		}
		f.v.Set(reflect.ValueOf(list))
	}
	return nil
}

// cloneSettings returns a deep copy of s.
func cloneSettings(s Settings) Settings {
	v := reflect.ValueOf(s).Elem()
	c := reflect.New(v.Type())
	c.Elem().Set(v)
	for _, f := range fields(c.Interface().(Settings)) {
		if f.v.Kind() == reflect.Slice && !f.v.IsNil() {
			f.v.Set(reflect.ValueOf(append([]string(nil), f.v.Interface().([]string)...)))
		}
	}
	return c.Interface().(Settings)
}
