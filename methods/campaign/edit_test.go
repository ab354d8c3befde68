package campaign_test

import (
	"bytes"
	"os"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"go.yaml.in/yaml/v3"
)

// fixture copies testdata/mini into a temporary folder and returns the
// campaign path.
func fixture(t *testing.T) string {
	t.Helper()
	dir := t.TempDir()
	if err := os.CopyFS(dir, os.DirFS("../../testdata/mini")); err != nil {
		t.Fatal(err)
	}
	return filepath.Join(dir, "campaign.yaml")
}

// An edit changes the fixture campaign at a YAML path such as
// "vehicle.wheelbase_m" or "evidence.ride_height[1].logs[0]":
//
//	set    the value at path becomes value (YAML text)
//	add    path is a mapping; key: value is appended to it
//	rename the key at path becomes key
//	delete the key at path (or the list item) goes
type edit struct {
	op, path, key, value string
}

func set(path, value string) edit         { return edit{op: "set", path: path, value: value} }
func add(path, key, value string) edit    { return edit{op: "add", path: path, key: key, value: value} }
func rename(path, key string) edit        { return edit{op: "rename", path: path, key: key} }
func remove(path string) edit             { return edit{op: "delete", path: path} }
func textEdit(old, new string) textChange { return textChange{old: old, new: new} }

// textChange replaces the one occurrence of old by new in a file's text:
// for what a YAML tree cannot hold (a syntax error) and for log files.
type textChange struct{ old, new string }

var step = regexp.MustCompile(`^([^.\[\]]+)((?:\[\d+\])*)`)

// lookup finds the node at path: the value node, the key node (nil in a
// list), the parent collection and the index of the key or item in it.
// With a key given twice, the last one counts (as a duplicate's problem
// stands there).
func lookup(t *testing.T, root *yaml.Node, path string) (val, key, parent *yaml.Node, at int) {
	t.Helper()
	n := root
	if n.Kind == yaml.DocumentNode {
		n = n.Content[0]
	}
	if path == "" {
		return n, nil, nil, 0
	}
	for _, part := range strings.Split(path, ".") {
		m := step.FindStringSubmatch(part)
		if m == nil {
			t.Fatalf("bad path %q", path)
		}
		found := false
		for i := len(n.Content) - 2; i >= 0 && n.Kind == yaml.MappingNode; i -= 2 {
			if n.Content[i].Value == m[1] {
				parent, key, val, at, n, found = n, n.Content[i], n.Content[i+1], i, n.Content[i+1], true
				break
			}
		}
		if !found {
			t.Fatalf("fixture drift: no %q in %q", m[1], path)
		}
		for _, ix := range regexp.MustCompile(`\d+`).FindAllString(m[2], -1) {
			k, _ := strconv.Atoi(ix)
			if n.Kind != yaml.SequenceNode || k >= len(n.Content) {
				t.Fatalf("fixture drift: no item %d at %q", k, path)
			}
			parent, key, val, at, n = n, nil, n.Content[k], k, n.Content[k]
		}
	}
	return val, key, parent, at
}

func parseValue(t *testing.T, text string) *yaml.Node {
	t.Helper()
	var doc yaml.Node
	if err := yaml.Unmarshal([]byte(text), &doc); err != nil {
		t.Fatalf("edit value %q: %v", text, err)
	}
	return doc.Content[0]
}

// apply makes the edits to the campaign file.
func apply(t *testing.T, file string, edits ...edit) {
	t.Helper()
	doc := readTree(t, file)
	for _, e := range edits {
		val, key, parent, at := lookup(t, doc, e.path)
		switch e.op {
		case "set":
			*val = *parseValue(t, e.value)
		case "add":
			val.Content = append(val.Content, &yaml.Node{Kind: yaml.ScalarNode, Value: e.key}, parseValue(t, e.value))
		case "rename":
			key.Value = e.key
		case "delete":
			if key != nil {
				parent.Content = append(parent.Content[:at], parent.Content[at+2:]...)
			} else {
				parent.Content = append(parent.Content[:at], parent.Content[at+1:]...)
			}
		}
	}
	var buf bytes.Buffer
	enc := yaml.NewEncoder(&buf)
	enc.SetIndent(2)
	if err := enc.Encode(doc); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(file, buf.Bytes(), 0o644); err != nil {
		t.Fatal(err)
	}
}

// lineOf returns the line on which the decoder sees the value at path in
// the (edited) campaign file.
func lineOf(t *testing.T, file, path string) int {
	t.Helper()
	val, _, _, _ := lookup(t, readTree(t, file), path)
	return val.Line
}

// readTree parses a YAML file into its document node.
func readTree(t *testing.T, file string) *yaml.Node {
	t.Helper()
	data, err := os.ReadFile(file)
	if err != nil {
		t.Fatal(err)
	}
	var doc yaml.Node
	if err := yaml.Unmarshal(data, &doc); err != nil {
		t.Fatal(err)
	}
	return &doc
}

// change makes a text change to a file and returns the line it is on.
func change(t *testing.T, file string, c textChange) int {
	t.Helper()
	data, err := os.ReadFile(file)
	if err != nil {
		t.Fatal(err)
	}
	text := string(data)
	if strings.Count(text, c.old) != 1 {
		t.Fatalf("fixture drift: %q occurs %d times in %s", c.old, strings.Count(text, c.old), file)
	}
	i := strings.Index(text, c.old)
	text = text[:i] + c.new + text[i+len(c.old):]
	if err := os.WriteFile(file, []byte(text), 0o644); err != nil {
		t.Fatal(err)
	}
	common := 0 // the change's line is that of its first changed character
	for common < len(c.old) && common < len(c.new) && c.old[common] == c.new[common] {
		common++
	}
	return strings.Count(text[:i+common], "\n") + 1
}
