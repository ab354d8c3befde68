package campaign

import (
	"fmt"
	"math"
	"reflect"
	"strconv"
	"strings"
	"sync"

	"go.yaml.in/yaml/v3"
)

// Place records where a YAML mapping stood and where each of its keys'
// values stood, so that validation can point at the line of the offending
// value and defaults can tell "absent" from "zero".
type Place struct {
	Where
	keys map[string]Where
}

// Has reports whether the mapping had the key.
func (p Place) Has(key string) bool { _, ok := p.keys[key]; return ok }

// Of returns the position of the key's value, or of the mapping itself when
// the key is absent.
func (p Place) Of(key string) Where {
	if w, ok := p.keys[key]; ok {
		return w
	}
	return p.Where
}

// nodeDecoder is implemented by types that read themselves from a YAML node
// (ordered maps, pairs written as two-element lists).
type nodeDecoder interface {
	decodeNode(d *decoder, n *yaml.Node, path string)
}

var placeType = reflect.TypeFor[Place]()

// decoder turns a yaml.Node tree into Go values strictly: unknown keys,
// duplicate keys, wrong kinds, non-finite numbers and missing required keys
// (struct tag `lf:"required"`) are all problems, and decoding goes on after
// each one so that a single run lists them all.
type decoder struct {
	file  string
	probs []*Problem
	// visits counts the nodes decoded: aliases can make a small document
	// expand exponentially ("billion laughs"), so decoding stops at a bound.
	visits int
}

// maxVisits bounds the nodes one document may expand to; a campaign with
// a million-row readings table belongs in a readings_file.
const maxVisits = 2_000_000

func (d *decoder) where(n *yaml.Node) Where {
	return Where{File: d.file, Line: n.Line, Column: n.Column}
}

func (d *decoder) fail(n *yaml.Node, path string, err error) {
	d.probs = append(d.probs, &Problem{Where: d.where(n), Path: path, Err: err})
}

type fieldInfo struct {
	index    int
	required bool
}

type structInfo struct {
	fields map[string]fieldInfo
	order  []string
	place  int // index of the Place field, or -1
}

var structCache sync.Map // reflect.Type → *structInfo

func infoOf(t reflect.Type) *structInfo {
	if si, ok := structCache.Load(t); ok {
		return si.(*structInfo)
	}
	si := &structInfo{fields: map[string]fieldInfo{}, place: -1}
	for i := range t.NumField() {
		f := t.Field(i)
		if f.Type == placeType {
			si.place = i
			continue
		}
		name, _, _ := strings.Cut(f.Tag.Get("yaml"), ",")
		if name == "" || name == "-" {
			continue
		}
		si.fields[name] = fieldInfo{index: i, required: f.Tag.Get("lf") == "required"}
		si.order = append(si.order, name)
	}
	structCache.Store(t, si)
	return si
}

func join(path, key string) string {
	if path == "" {
		return key
	}
	return path + "." + key
}

func describe(n *yaml.Node) string {
	switch n.Kind {
	case yaml.MappingNode:
		return "a mapping"
	case yaml.SequenceNode:
		return "a list"
	}
	switch n.ShortTag() {
	case "!!null":
		return "nothing"
	case "!!str", "!!timestamp":
		return fmt.Sprintf("text %q", n.Value)
	}
	return fmt.Sprintf("%q", n.Value)
}

func (d *decoder) decode(n *yaml.Node, v reflect.Value, path string) {
	d.visits++
	if d.visits == maxVisits {
		d.fail(n, path, wrapf(ErrSyntax, "the document expands to more than %d values (aliases?)", maxVisits))
	}
	if d.visits >= maxVisits {
		return
	}
	for n.Kind == yaml.AliasNode {
		n = n.Alias
	}
	if v.CanAddr() {
		if nd, ok := v.Addr().Interface().(nodeDecoder); ok {
			nd.decodeNode(d, n, path)
			return
		}
	}
	isNull := n.Kind == yaml.ScalarNode && n.ShortTag() == "!!null"
	switch v.Kind() {
	case reflect.Pointer:
		if isNull {
			return
		}
		e := reflect.New(v.Type().Elem())
		d.decode(n, e.Elem(), path)
		v.Set(e)
	case reflect.Struct:
		d.decodeStruct(n, v, path)
	case reflect.Slice:
		if isNull {
			return
		}
		if n.Kind != yaml.SequenceNode {
			d.fail(n, path, wrapf(ErrType, "want a list, got %s", describe(n)))
			return
		}
		s := reflect.MakeSlice(v.Type(), len(n.Content), len(n.Content))
		for i, c := range n.Content {
			d.decode(c, s.Index(i), fmt.Sprintf("%s[%d]", path, i))
		}
		v.Set(s)
	case reflect.String:
		if n.Kind != yaml.ScalarNode || isNull {
			d.fail(n, path, wrapf(ErrType, "want text, got %s", describe(n)))
			return
		}
		v.SetString(n.Value)
	case reflect.Float64:
		x, ok := d.number(n, path)
		if ok {
			v.SetFloat(x)
		}
	case reflect.Int, reflect.Int64:
		if n.Kind != yaml.ScalarNode || n.ShortTag() != "!!int" {
			d.fail(n, path, wrapf(ErrType, "want a whole number, got %s", describe(n)))
			return
		}
		i, err := strconv.ParseInt(strings.ReplaceAll(n.Value, "_", ""), 0, 64)
		if err != nil {
			d.fail(n, path, wrapf(ErrType, "want a whole number, got %s", describe(n)))
			return
		}
		v.SetInt(i)
	case reflect.Bool:
		if n.Kind != yaml.ScalarNode || n.ShortTag() != "!!bool" {
			d.fail(n, path, wrapf(ErrType, "want true or false, got %s", describe(n)))
			return
		}
		v.SetBool(n.Value == "true" || n.Value == "True" || n.Value == "TRUE")
	default:
		panic(fmt.Sprintf("methods: decoder cannot fill %s", v.Type())) // a bug in our types, not in the input
	}
}

// number reads a finite float from an int or float scalar.
func (d *decoder) number(n *yaml.Node, path string) (float64, bool) {
	tag := n.ShortTag()
	if n.Kind != yaml.ScalarNode || (tag != "!!int" && tag != "!!float") {
		d.fail(n, path, wrapf(ErrType, "want a number, got %s", describe(n)))
		return 0, false
	}
	var x float64
	var err error
	if tag == "!!int" {
		var i int64
		i, err = strconv.ParseInt(strings.ReplaceAll(n.Value, "_", ""), 0, 64)
		x = float64(i)
	} else {
		x, err = strconv.ParseFloat(strings.ReplaceAll(n.Value, "_", ""), 64)
	}
	if err != nil || math.IsInf(x, 0) || math.IsNaN(x) {
		d.fail(n, path, wrapf(ErrRange, "want a finite number, got %q", n.Value))
		return 0, false
	}
	return x, true
}

func (d *decoder) decodeStruct(n *yaml.Node, v reflect.Value, path string) {
	si := infoOf(v.Type())
	if n.Kind != yaml.MappingNode {
		d.fail(n, path, wrapf(ErrType, "want a mapping, got %s", describe(n)))
		return
	}
	place := Place{Where: d.where(n), keys: map[string]Where{}}
	for i := 0; i+1 < len(n.Content); i += 2 {
		k, val := n.Content[i], n.Content[i+1]
		if k.Kind != yaml.ScalarNode {
			d.fail(k, path, wrapf(ErrType, "a key must be a plain word, got %s", describe(k)))
			continue
		}
		fi, ok := si.fields[k.Value]
		if !ok {
			d.fail(k, join(path, k.Value), wrapf(ErrUnknownKey, "unknown key %q (known here: %s)", k.Value, strings.Join(si.order, ", ")))
			continue
		}
		if _, dup := place.keys[k.Value]; dup {
			d.fail(k, join(path, k.Value), wrapf(ErrDuplicate, "key %q given twice", k.Value))
			continue
		}
		place.keys[k.Value] = d.where(val)
		d.decode(val, v.Field(fi.index), join(path, k.Value))
	}
	for _, name := range si.order {
		if fi := si.fields[name]; fi.required && !place.Has(name) {
			d.fail(n, join(path, name), wrapf(ErrMissing, "missing required key %q", name))
		}
	}
	if si.place >= 0 {
		v.Field(si.place).Set(reflect.ValueOf(place))
	}
}

// Value is one entry of a YAML mapping from names to numbers, kept in the
// order written, with its position.
type Value struct {
	Key string
	V   float64
	At  Where
}

// Values is an ordered name → number mapping such as a reading's
// `pa: {r1: -402.0, f1: -95.5}` or `plan.cost_h`.
type Values []Value

// Get returns the value under key.
func (vs Values) Get(key string) (float64, bool) {
	for _, v := range vs {
		if v.Key == key {
			return v.V, true
		}
	}
	return 0, false
}

func (vs *Values) decodeNode(d *decoder, n *yaml.Node, path string) {
	d.eachEntry(n, path, "numbers", func(k, val *yaml.Node, p string) {
		if x, ok := d.number(val, p); ok {
			*vs = append(*vs, Value{Key: k.Value, V: x, At: d.where(val)})
		}
	})
}

// eachEntry calls f for each key of a mapping of plain words to values
// (what), after refusing a non-mapping, a key that is not a plain word and
// a key given twice; aliases are followed.
func (d *decoder) eachEntry(n *yaml.Node, path, what string, f func(k, val *yaml.Node, p string)) {
	if n.Kind != yaml.MappingNode {
		d.fail(n, path, wrapf(ErrType, "want a mapping of names to %s, got %s", what, describe(n)))
		return
	}
	seen := map[string]bool{}
	for i := 0; i+1 < len(n.Content); i += 2 {
		k, val := n.Content[i], n.Content[i+1]
		for val.Kind == yaml.AliasNode {
			val = val.Alias
		}
		p := join(path, k.Value)
		switch {
		case k.Kind != yaml.ScalarNode:
			d.fail(k, path, wrapf(ErrType, "a key must be a plain word, got %s", describe(k)))
		case seen[k.Value]:
			d.fail(k, p, wrapf(ErrDuplicate, "key %q given twice", k.Value))
		default:
			seen[k.Value] = true
			f(k, val, p)
		}
	}
}

// Names is an ordered name → text mapping such as a pressure log's
// `taps: {u1: p_u1, l1: p_l1}` (tap id → column).
type Names []Name

// Name is one entry of Names.
type Name struct {
	Key, V string
	At     Where
}

func (ns *Names) decodeNode(d *decoder, n *yaml.Node, path string) {
	d.eachEntry(n, path, "column names", func(k, val *yaml.Node, p string) {
		if val.Kind != yaml.ScalarNode || val.ShortTag() == "!!null" {
			d.fail(val, p, wrapf(ErrType, "want a column name, got %s", describe(val)))
			return
		}
		*ns = append(*ns, Name{Key: k.Value, V: val.Value, At: d.where(val)})
	})
}

// Pair is a two-number list such as a calibration point [signal, mm].
type Pair struct {
	A, B float64
	At   Where
}

func (p *Pair) decodeNode(d *decoder, n *yaml.Node, path string) {
	p.At = d.where(n)
	if n.Kind != yaml.SequenceNode || len(n.Content) != 2 {
		d.fail(n, path, wrapf(ErrType, "want a pair [signal, mm], got %s", describe(n)))
		return
	}
	p.A, _ = d.number(n.Content[0], path+"[0]")
	p.B, _ = d.number(n.Content[1], path+"[1]")
}

func reflectValue(p any) reflect.Value { return reflect.ValueOf(p).Elem() }
