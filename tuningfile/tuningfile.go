// Package tuningfile reads and writes fifthline.toml, where a rehearsal
// folder (or a user, in the configuration folder) declares its tuning once:
// key, temperament, reference pitch, anchor and transposition, in the same
// words the musical flags take. Every value is checked with target's parsers
// while the file is read, so a mistake names its file and line. It is not
// for the chord (that changes with the music), nor for finding the files or
// deciding which one wins: the command does that.
package tuningfile

import (
	"bytes"
	"errors"
	"fmt"
	"strconv"
	"strings"

	"github.com/BurntSushi/toml"

	"fifthline/target"
)

// Name is the file's name, in the rehearsal folder and in the user's
// configuration folder.
const Name = "fifthline.toml"

// Values are the settings as the musical flags spell them; "" is unset.
type Values struct {
	Key, Temperament, A4, Anchor, Transpose string
}

// Fields are the settings' names in the file (and as flags), in the order
// they are written.
var Fields = []string{"key", "temperament", "a4", "anchor", "transpose"}

// Field is the setting called name (one of Fields), or nil.
func (v *Values) Field(name string) *string {
	switch name {
	case "key":
		return &v.Key
	case "temperament":
		return &v.Temperament
	case "a4":
		return &v.A4
	case "anchor":
		return &v.Anchor
	case "transpose":
		return &v.Transpose
	}
	return nil
}

// setting is one value in the file, checked as it is decoded so that the
// TOML reader's error carries the line.
type setting struct {
	text  *string
	check func(string) (string, error) // the value as it will be used, or why not
}

func (s *setting) UnmarshalText(b []byte) error {
	v, err := s.check(string(b))
	if err != nil {
		return err
	}
	*s.text = v
	return nil
}

// Parse reads a file's contents; name is how errors call the file.
// checkTemperament judges a temperament that is none of target's names (a
// temperament file): nil refuses it.
func Parse(name string, data []byte, checkTemperament func(spec string) error) (Values, error) {
	var v Values
	checks := map[string]func(string) (string, error){
		"key": func(s string) (string, error) {
			k, err := target.ParseKey(s)
			return k.String(), err
		},
		"temperament": func(s string) (string, error) {
			if _, err := target.ParseTemperament(s); err == nil || checkTemperament == nil {
				return s, err
			}
			return s, checkTemperament(s)
		},
		"a4": func(s string) (string, error) {
			f, err := target.ParseA4(s)
			return strconv.FormatFloat(f, 'f', -1, 64), err
		},
		"anchor": func(s string) (string, error) {
			a, err := target.ParseAnchor(s)
			return a.String(), err
		},
		"transpose": func(s string) (string, error) {
			_, err := target.ParseTransposition(s)
			return strings.TrimSpace(s), err
		},
	}
	var doc struct {
		Key         setting `toml:"key"`
		Temperament setting `toml:"temperament"`
		A4          setting `toml:"a4"`
		Anchor      setting `toml:"anchor"`
		Transpose   setting `toml:"transpose"`
	}
	for _, s := range []struct {
		field string
		set   *setting
	}{{"key", &doc.Key}, {"temperament", &doc.Temperament}, {"a4", &doc.A4}, {"anchor", &doc.Anchor}, {"transpose", &doc.Transpose}} {
		*s.set = setting{text: v.Field(s.field), check: checks[s.field]}
	}
	md, err := toml.Decode(string(data), &doc)
	if err != nil {
		return Values{}, fileError(name, err)
	}
	if extra := md.Undecoded(); len(extra) > 0 {
		k := extra[0].String()
		return Values{}, fmt.Errorf("%s line %d: unknown setting %q (%s holds %s)", name, lineOf(data, extra[0][0]), k, Name, strings.Join(Fields, ", "))
	}
	return v, nil
}

// fileError says where in the file the reader stopped, in one line.
func fileError(name string, err error) error {
	var pe toml.ParseError
	if errors.As(err, &pe) {
		// target's messages name flags ("--a4 -440 is outside…"); here the
		// value is a setting.
		msg := strings.TrimPrefix(pe.Message, "--")
		if pe.LastKey != "" && !strings.Contains(msg, pe.LastKey) {
			msg = pe.LastKey + ": " + msg
		}
		return fmt.Errorf("%s line %d: %s", name, pe.Position.Line, msg)
	}
	// The reader's other errors (a list where a value belongs) say
	// "toml: line N (last key ...): why".
	msg := strings.TrimPrefix(err.Error(), "toml: ")
	if strings.HasPrefix(msg, "line ") {
		return fmt.Errorf("%s %s", name, msg)
	}
	return fmt.Errorf("%s: %s", name, msg)
}

// lineOf is the first line that sets key (or opens a table of that name),
// for the errors the TOML reader gives without one.
func lineOf(data []byte, key string) int {
	for i, line := range strings.Split(string(data), "\n") {
		l := strings.TrimLeft(strings.TrimSpace(line), "[")
		l = strings.Trim(l, `"'`)
		if strings.HasPrefix(l, key) {
			return i + 1
		}
	}
	return 1
}

// Encode writes the set values as TOML, in the order of Fields, under a
// line saying what the file is.
func Encode(v Values) []byte {
	var b bytes.Buffer
	b.WriteString("# The tuning this folder's rehearsals use; fifthline reads it when a musical flag is absent.\n")
	b.WriteString("# Written by 'fifthline tuning --save'; edit it freely.\n")
	enc := toml.NewEncoder(&b)
	for _, f := range Fields {
		s := *v.Field(f)
		if s == "" {
			continue
		}
		var val any = s
		if f == "a4" {
			if hz, err := target.ParseA4(s); err == nil { // "415 Hz" is saved as 415
				val = hz
			}
		}
		enc.Encode(map[string]any{f: val}) // to a buffer: cannot fail
	}
	return b.Bytes()
}
