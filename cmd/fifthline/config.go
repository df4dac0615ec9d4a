package main

// The tuning in force: a musical flag wins; where one is absent, its value
// comes from ./fifthline.toml (the rehearsal folder's tuning), else from
// fifthline.toml in the user's configuration folder, else the default
// (interface contract, "Musical flags"). Each value remembers where it came
// from, so that a command can say so in one line.

import (
	"errors"
	"flag"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"strings"

	"fifthline/target"
	"fifthline/tuningfile"
)

// Where a value came from, besides a file's path.
const (
	fromFlag    = "flag"
	fromDefault = "default"
)

// tuningFile is a fifthline.toml that was found, with its values.
type tuningFile struct {
	path   string // as shown to the user
	values tuningfile.Values
}

// localTuningPath is the rehearsal folder's file: the working directory's.
var localTuningPath = "./" + tuningfile.Name

// userTuningPath is the user-wide file, or "" when there is no
// configuration folder.
func userTuningPath() string {
	dir, err := os.UserConfigDir()
	if err != nil {
		return ""
	}
	return filepath.Join(dir, "fifthline", tuningfile.Name)
}

// readTuningFile reads a fifthline.toml; a missing file is (nil, nil). A
// temperament file it names is found beside it.
func readTuningFile(path string) (*tuningFile, error) {
	data, err := os.ReadFile(path)
	if errors.Is(err, os.ErrNotExist) {
		return nil, nil
	}
	if err != nil {
		return nil, usagef("%v", err)
	}
	dir := filepath.Dir(path)
	v, err := tuningfile.Parse(showPath(path), data, func(spec string) error {
		_, err := parseTemperament(besides(dir, spec))
		return err
	})
	if err != nil {
		return nil, usageError{err.Error()}
	}
	if _, err := target.ParseTemperament(v.Temperament); err != nil && v.Temperament != "" {
		v.Temperament = besides(dir, v.Temperament)
	}
	return &tuningFile{path: showPath(path), values: v}, nil
}

// besides resolves a relative path against dir.
func besides(dir, path string) string {
	if filepath.IsAbs(path) {
		return path
	}
	return filepath.Join(dir, path)
}

// showPath writes the home folder as ~, as people say it.
func showPath(path string) string {
	if home, err := os.UserHomeDir(); err == nil && home != "" && strings.HasPrefix(path, home+"/") {
		return "~" + path[len(home):]
	}
	return path
}

// tuningFiles are the files in force, the rehearsal folder's first.
func tuningFiles() ([]*tuningFile, error) {
	var found []*tuningFile
	for _, p := range []string{localTuningPath, userTuningPath()} {
		if p == "" {
			continue
		}
		f, err := readTuningFile(p)
		if err != nil {
			return nil, err
		}
		if f != nil {
			found = append(found, f)
		}
	}
	return found, nil
}

// applyFiles fills the musical flags that were not given from the tuning
// files (unless the command has its own defaults) and records where each
// value came from. Values set in code, without a flag set, stand as given.
func (m *musicalFlags) applyFiles() error {
	m.origin = map[string]string{}
	given := map[string]bool{}
	if m.fs == nil {
		for _, name := range tuningfile.Fields {
			given[name] = true
		}
	} else {
		m.fs.Visit(func(f *flag.Flag) { given[f.Name] = true })
	}
	var files []*tuningFile
	if m.defaultsFrom == "" && m.fs != nil {
		var err error
		if files, err = tuningFiles(); err != nil {
			return err
		}
	}
	for _, name := range tuningfile.Fields {
		m.origin[name] = fromFlag
		if given[name] {
			continue
		}
		m.origin[name] = fromDefault
		if m.defaultsFrom != "" {
			m.origin[name] = m.defaultsFrom
		}
		for _, f := range files {
			if v := *f.values.Field(name); v != "" {
				*m.field(name) = v
				m.origin[name] = f.path
				break
			}
		}
	}
	return nil
}

// field is the flag's value by its name in tuningfile.Fields.
func (m *musicalFlags) field(name string) *string {
	return map[string]*string{"key": &m.key, "temperament": &m.temperament, "a4": &m.a4, "anchor": &m.anchor, "transpose": &m.transpose}[name]
}

// say tells, in one line on w, which tuning is in force and where it came
// from, unless every value was given as a flag. Call it once the command
// has started its work, so that an error stays the only line.
func (m *musicalFlags) say(w io.Writer, tu target.Tuning) {
	if text := m.whence(); text != "" {
		fmt.Fprintf(w, "fifthline: tuning %s (%s)\n", tu, text)
	}
}

// whence says where the values not given as flags came from: "key, a4 from
// ./fifthline.toml; temperament by default". Anchor and transposition are
// named only when a file set them.
func (m *musicalFlags) whence() string {
	var order []string
	by := map[string][]string{}
	for _, name := range tuningfile.Fields {
		o := m.origin[name]
		if o == fromFlag || (o == fromDefault || o == m.defaultsFrom) && (name == "anchor" || name == "transpose") {
			continue
		}
		if by[o] == nil {
			order = append(order, o)
		}
		by[o] = append(by[o], name)
	}
	var parts []string
	for _, o := range order {
		switch o {
		case fromDefault:
			parts = append(parts, strings.Join(by[o], ", ")+" by default")
		default:
			parts = append(parts, strings.Join(by[o], ", ")+" from "+o)
		}
	}
	return strings.Join(parts, "; ")
}

// tableTitle is a table's first line: the tuning (with what more the table
// is read against), and where it came from when no flag set it.
func tableTitle(tuning, whence string) string {
	if whence == "" {
		return tuning
	}
	return fmt.Sprintf("%s   (%s)", tuning, whence)
}
