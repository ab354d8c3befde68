package campaign

import (
	"bytes"
	"crypto/sha256"
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"

	"go.yaml.in/yaml/v3"
)

// Options changes how a campaign is loaded.
type Options struct {
	// Stream leaves the logs' bodies to the adapters, so that a run reads
	// each log once: Load reads only their headers (and the speed files
	// and tables, whole); the adapters check every row through Rows and
	// feed the input hash as they read (Campaign.Read), and Finish, called
	// after them, completes validation. On bad input, found by Load or by
	// Finish, the campaign is loaded again with every log read through,
	// so that every problem is listed at once, as without it. Without it
	// Load reads every log through, as Parse always does.
	Stream bool
	// HashLater leaves the input hash out of the adapters' reads of the
	// logs (Campaign.Read), for a command whose output does not carry it
	// (reduce's text, validate): hashing a log costs about a quarter of
	// reading it. Hash, if asked all the same, reads those files again
	// and gives the same sum.
	HashLater bool
}

// Load reads, decodes and validates the campaign at path. On any error it
// returns Problems listing every one found, in file order; warnings are in
// the returned campaign's Warnings.
func Load(path string, opt Options) (*Campaign, error) {
	f, err := OpenRegular(path)
	if err != nil {
		return nil, Problems{{Where: Where{File: path}, Err: wrapf(ErrFile, "cannot read campaign: %v", err)}}
	}
	defer f.Close()
	d := &digest{h: sha256.New(), later: opt.HashLater}
	src, done := d.start(f)
	c, err := parse(src, path, filepath.Dir(path), opt, d, done)
	if err != nil && opt.Stream {
		// Bad input: load again with every log read through, so that
		// the problems in the logs' bodies are listed with the others.
		opt.Stream = false
		return Load(path, opt)
	}
	return c, err
}

// Parse reads a campaign from src; name is used in messages and dir is the
// folder relative to which the campaign's paths are resolved.
func Parse(src io.Reader, name, dir string, opt Options) (*Campaign, error) {
	return parse(src, name, dir, opt, nil, func() {})
}

// parse is Parse; sum, if not nil, is the digest of the campaign file read
// from src (Load's), which done ends once the file is read.
func parse(src io.Reader, name, dir string, opt Options, sum *digest, done func()) (*Campaign, error) {
	root, err := readNode(src, name)
	done()
	if err != nil {
		return nil, err
	}
	c := &Campaign{File: name, Dir: dir, Files: []string{name}, digest: sum}
	if opt.Stream && sum != nil {
		c.stream = &stream{opt: opt, reads: map[*LogSpec]*scanResult{}}
	}
	d := &decoder{file: name}
	if p := otherDocument(d, root); p != nil {
		return nil, Problems{p}
	}
	d.decode(root, reflectValue(c), "")
	applyDefaults(c)
	v := &validator{c: c, opt: opt}
	v.run()
	// Every problem of every kind at once: the validator's, except where a
	// key it checks already failed to decode (it would only repeat that).
	probs := append([]*Problem(nil), d.probs...)
	for _, p := range v.errs {
		if !underAny(p.Path, d.probs) && !cascades(p, d.probs) {
			probs = append(probs, p)
		}
	}
	if len(probs) > 0 {
		sortProblems(probs)
		return nil, Problems(probs)
	}
	c.Warnings = v.warns
	if c.stream != nil {
		c.stream.informed = v.informed
	}
	return c, nil
}

// underAny reports whether path is at, above or below the path of one of
// the problems.
func underAny(path string, probs []*Problem) bool {
	for _, p := range probs {
		if p.Path == "" || path == p.Path || strings.HasPrefix(path, p.Path+".") || strings.HasPrefix(path, p.Path+"[") ||
			strings.HasPrefix(p.Path, path+".") || strings.HasPrefix(p.Path, path+"[") {
			return true
		}
	}
	return false
}

var entryPath = regexp.MustCompile(`^evidence\.\w+\[\d+\]`)

// cascades reports whether a validation problem only follows from a part
// of the campaign that failed to decode: a reference into configurations or
// taps that could not be read, a rule on a body style that could not be
// read, a plan cost of entries that could not be read.
func cascades(p *Problem, decoded []*Problem) bool {
	failed := func(prefix string) bool { return underAny(prefix, decoded) }
	entry := entryPath.FindString(p.Path)
	switch {
	case errors.Is(p, ErrReference) && strings.Contains(p.Err.Error(), "configuration"):
		return failed("configurations")
	case errors.Is(p, ErrNotApply) && strings.HasPrefix(p.Path, "evidence.vortex"):
		return failed("vehicle.body")
	case strings.HasPrefix(p.Path, "plan.cost_h"):
		return failed("evidence")
	case entry != "" && strings.Contains(p.Path, ".readings"):
		return failed(entry+".taps") || failed(entry+".taps_file")
	}
	return false
}

// otherDocument recognises a document that is not a campaign of format 1 —
// another format number, a simulation spec, a result document — and
// returns one clear problem for it instead of a list of unknown keys.
func otherDocument(d *decoder, root *yaml.Node) *Problem {
	if root.Kind != yaml.MappingNode {
		return nil
	}
	for i := 0; i+1 < len(root.Content); i += 2 {
		k, v := root.Content[i], root.Content[i+1]
		switch {
		case k.Value == "liftfuse" && v.Value != "1":
			return &Problem{Where: d.where(v), Path: "liftfuse",
				Err: wrapf(ErrFormat, "campaign format %q is not supported (this liftfuse reads format 1)", v.Value)}
		case k.Value == "liftfuse_simulate":
			return &Problem{Where: d.where(k), Path: k.Value,
				Err: wrapf(ErrFormat, "this is a simulation spec, not a campaign: run `liftfuse simulate` on it to make a campaign")}
		case k.Value == "format" && strings.HasPrefix(v.Value, "liftfuse."):
			return &Problem{Where: d.where(v), Path: k.Value,
				Err: wrapf(ErrFormat, "this is a liftfuse output document (%s), not a campaign", v.Value)}
		}
	}
	return nil
}

// MaxDocumentBytes is the largest campaign (or other YAML document of ours)
// read; a larger file is refused, never truncated.
const MaxDocumentBytes = 64 << 20

// readNode reads a YAML document into its root node. A second document in
// the same file is refused: it would otherwise be silently ignored.
func readNode(src io.Reader, name string) (*yaml.Node, error) {
	data, err := io.ReadAll(io.LimitReader(src, MaxDocumentBytes+1))
	if err != nil {
		return nil, Problems{{Where: Where{File: name}, Err: wrapf(ErrFile, "cannot read: %v", err)}}
	}
	if len(data) > MaxDocumentBytes {
		return nil, Problems{{Where: Where{File: name}, Err: wrapf(ErrRange, "the file is larger than %d MiB; a campaign is a few kB (logs belong in their own files)", MaxDocumentBytes>>20)}}
	}
	dec := yaml.NewDecoder(bytes.NewReader(data))
	var doc yaml.Node
	if err := dec.Decode(&doc); err != nil {
		if err == io.EOF {
			return nil, Problems{{Where: Where{File: name, Line: 1}, Err: wrapf(ErrSyntax, "empty file")}}
		}
		return nil, Problems{syntaxProblem(name, err)}
	}
	var next yaml.Node
	switch err := dec.Decode(&next); {
	case err == io.EOF:
	case err != nil:
		return nil, Problems{syntaxProblem(name, err)}
	default:
		return nil, Problems{{Where: Where{File: name, Line: next.Line, Column: next.Column}, Err: wrapf(ErrSyntax, "a second YAML document (after ---) is not read; one file holds one document")}}
	}
	root := &doc
	if root.Kind == yaml.DocumentNode && len(root.Content) == 1 {
		root = root.Content[0]
	}
	return root, nil
}

// parserProblems are the messages of yaml.v3's parser (not its scanner).
var parserProblems = []string{
	"did not find expected node content",
	"did not find expected ',' or '}'",
	"did not find expected ',' or ']'",
	"did not find expected key",
	"did not find expected '-' indicator",
	"did not find expected <document start>",
}

var yamlLine = regexp.MustCompile(`line (\d+)`)

// syntaxProblem turns a yaml syntax error ("yaml: line 4: did not find …")
// into a Problem at that line.
func syntaxProblem(name string, err error) *Problem {
	w := Where{File: name, Line: 1}
	msg := err.Error()
	if m := yamlLine.FindStringSubmatch(msg); m != nil {
		w.Line, _ = strconv.Atoi(m[1])
		// yaml.v3 reports a parser error (unlike a scanner error) at the
		// 0-based line of its context mark: make it 1-based.
		for _, p := range parserProblems {
			if strings.Contains(msg, p) {
				w.Line++
				break
			}
		}
	}
	msg = yamlLine.ReplaceAllString(msg, "")
	msg = regexp.MustCompile(`^yaml: *:? *`).ReplaceAllString(msg, "")
	return &Problem{Where: w, Err: wrapf(ErrSyntax, "%s", msg)}
}

// Path resolves a path written in the campaign against its folder.
func (c *Campaign) Path(p string) string {
	if filepath.IsAbs(p) {
		return p
	}
	return filepath.Join(c.Dir, p)
}

func unwrapPath(err error) error {
	if pe, ok := err.(*os.PathError); ok {
		return pe.Err
	}
	return err
}

// Decode reads YAML from src into v strictly, with the campaign loader's
// rules (unknown keys, wrong kinds, non-finite numbers and missing required
// keys are Problems with file:line:column). v must be a pointer to a struct
// built like Campaign's. It is for other documents of ours, such as the
// simulation spec.
func Decode(src io.Reader, name string, v any) error {
	root, err := readNode(src, name)
	if err != nil {
		return err
	}
	d := &decoder{file: name}
	d.decode(root, reflectValue(v), "")
	if len(d.probs) > 0 {
		sortProblems(d.probs)
		return Problems(d.probs)
	}
	return nil
}

// Errorf returns a Problem at w with path, wrapping kind, for documents
// checked outside this package.
func Errorf(w Where, path string, kind error, format string, args ...any) *Problem {
	return &Problem{Where: w, Path: path, Err: wrapf(kind, format, args...)}
}

// ErrNotRegular is wrapped when a path names a FIFO, a device, a folder or
// anything else that is not a regular file: reading it could block forever
// or read without end.
var ErrNotRegular = errors.New("not a regular file")

// OpenRegular opens name for reading only if it is a regular file (or a
// link to one). It checks before opening, since opening a FIFO blocks.
func OpenRegular(name string) (*os.File, error) {
	if name == "" {
		return nil, fmt.Errorf("no file named (the path is empty)")
	}
	fi, err := os.Stat(name)
	if err != nil {
		return nil, unwrapPath(err)
	}
	if !fi.Mode().IsRegular() {
		what := "a folder"
		switch m := fi.Mode(); {
		case m&os.ModeNamedPipe != 0:
			what = "a named pipe (FIFO)"
		case m&(os.ModeDevice|os.ModeCharDevice) != 0:
			what = "a device"
		case m&os.ModeSocket != 0:
			what = "a socket"
		case !m.IsDir():
			what = "not a plain file"
		}
		return nil, fmt.Errorf("%w: it is %s", ErrNotRegular, what)
	}
	f, err := os.Open(name)
	if err != nil {
		return nil, unwrapPath(err)
	}
	return f, nil
}

// Open opens a file named in the campaign (relative to its folder) with
// OpenRegular's rules.
func (c *Campaign) Open(p string) (*os.File, error) {
	if p == "" {
		return nil, fmt.Errorf("no file named (the path is empty)")
	}
	return OpenRegular(c.Path(p))
}
