package target

import (
	"errors"
	"fmt"
	"math"
	"regexp"
	"strconv"
	"strings"

	"fifthline/internal/typo"
)

// Builtin lists the named temperaments ParseTemperament knows, in the order a
// screen cycles through them.
var Builtin = []string{"equal", "meantone:1/4", "meantone:1/6", "meantone:1/5", "meantone:1/3", "meantone:2/7",
	"pythagorean", "edo:31", "edo:19", "edo:53", "werckmeister3", "kirnberger3", "vallotti", "young", "just"}

// ErrUnknownTemperament is wrapped by ParseTemperament's error for a name it
// does not know at all, as against a known kind with an unusable value; a
// command can then tell whether a missing file was meant.
var ErrUnknownTemperament = errors.New("unknown temperament")

// ParseTemperament reads a --temperament spec other than a file path:
// equal, pythagorean, meantone:P/Q, fifth:CENTS, edo:N, werckmeister3,
// kirnberger3, vallotti, young, just. It also takes the names screens show
// and musicians write ("Werckmeister III", "¼-comma meantone",
// "quarter-comma", "31-EDO", "edo31"), in any case, with or without spaces
// and hyphens.
func ParseTemperament(spec string) (Temperament, error) {
	s := strings.ToLower(strings.TrimSpace(spec))
	if kind, arg, ok := strings.Cut(s, ":"); ok {
		if tm, known, err := parseKind(spec, strings.TrimSpace(kind), strings.TrimSpace(arg)); known {
			return tm, err
		}
	}
	f := fold(s)
	if tm, ok := named[f]; ok {
		return tm, nil
	}
	for _, a := range aliases {
		if m := a.re.FindStringSubmatch(f); m != nil {
			tm, _, err := parseKind(spec, a.kind, a.arg(m))
			return tm, err
		}
	}
	return nil, fmt.Errorf("%w %q (%s)", ErrUnknownTemperament, spec, suggest(f))
}

// parseKind reads the kind:argument forms; known is false for another kind.
func parseKind(spec, kind, arg string) (tm Temperament, known bool, err error) {
	switch kind {
	case "meantone":
		ns, ds, ok := strings.Cut(arg, "/")
		num, err1 := strconv.Atoi(strings.TrimSpace(ns))
		den, err2 := strconv.Atoi(strings.TrimSpace(ds))
		if !ok || err1 != nil || err2 != nil {
			return nil, true, fmt.Errorf("temperament %q: write meantone:P/Q with whole numbers, like meantone:1/4", spec)
		}
		tm, err = Meantone(num, den)
	case "fifth":
		f, perr := strconv.ParseFloat(arg, 64)
		if perr != nil || math.IsInf(f, 0) {
			return nil, true, fmt.Errorf("temperament %q: the fifth must be a number of cents, like fifth:696.5", spec)
		}
		tm, err = NewRegular(f)
		if err != nil {
			err = fmt.Errorf("temperament %q: %v", spec, err)
		}
	case "edo":
		n, perr := strconv.Atoi(arg)
		if perr != nil {
			return nil, true, fmt.Errorf("temperament %q: write edo:N with a whole number, like edo:31", spec)
		}
		tm, err = EDO(n)
	default:
		return nil, false, nil
	}
	if err != nil {
		return nil, true, err
	}
	return tm, true, nil
}

// fold writes a temperament name one way: lower case (already), no spaces,
// hyphens, underscores or cent signs, fraction signs as digits, Roman
// numerals as digits, comma fractions in words as digits.
func fold(s string) string {
	s = strings.NewReplacer(" ", "", "-", "", "_", "", "¢", "", "cents", "",
		"¼", "1/4", "⅙", "1/6", "⅕", "1/5", "⅓", "1/3", "½", "1/2", "⅛", "1/8", "⅐", "1/7").Replace(s)
	s = commaWords.ReplaceAllStringFunc(s, func(w string) string {
		return commaFractions[strings.TrimSuffix(w, "comma")] + "comma"
	})
	return romanEnd.ReplaceAllStringFunc(s, func(r string) string { return map[string]string{"ii": "2", "iii": "3"}[r] })
}

var (
	commaFractions = map[string]string{"quarter": "1/4", "sixth": "1/6", "fifth": "1/5", "third": "1/3",
		"half": "1/2", "eighth": "1/8", "twosevenths": "2/7", "twoseventh": "2/7"}
	commaWords = regexp.MustCompile(`(quarter|sixth|fifth|third|half|eighth|twosevenths?)comma`)
	romanEnd   = regexp.MustCompile(`(iii|ii)$`)
)

// named are the folded names of the fixed temperaments, with the names
// their Name methods give screens.
var named = func() map[string]Temperament {
	m := map[string]Temperament{
		"equal": Equal, "et": Equal, "12tet": Equal, "12et": Equal, "equaltemperament": Equal,
		"pythagorean": Pythagorean, "pythagoreantuning": Pythagorean,
		"just": Just{}, "justintonation": Just{}, "5limitjust": Just{},
		"werckmeister": circulating["werckmeister3"], "kirnberger": circulating["kirnberger3"],
	}
	// "Meantone" unqualified is the quarter-comma kind (common practice).
	m["meantone"], _ = Meantone(1, 4)
	for spec, c := range circulating {
		m[spec] = c
	}
	for _, tm := range []Temperament{Equal, Pythagorean, Just{}, circulating["werckmeister3"],
		circulating["kirnberger3"], circulating["vallotti"], circulating["young"]} {
		m[fold(strings.ToLower(tm.Name()))] = tm
	}
	return m
}()

// aliases are the written forms of the parametrised kinds, matched against
// folded names.
var aliases = []struct {
	re   *regexp.Regexp
	kind string
	arg  func(m []string) string
}{
	{regexp.MustCompile(`^(\d+/\d+)(syntonic)?comma(meantone)?$`), "meantone", first},
	{regexp.MustCompile(`^meantone(\d+/\d+)(comma)?$`), "meantone", first},
	{regexp.MustCompile(`^(?:edo|tet)(\d+)$`), "edo", first},
	{regexp.MustCompile(`^(\d+)(?:edo|tet|et)$`), "edo", first},
	{regexp.MustCompile(`^(?:regular,?)?fifth([0-9.]+)$`), "fifth", first},
}

func first(m []string) string { return m[1] }

// suggest names the known temperament nearest a folded unknown name, or
// lists the usual ones when none is near.
func suggest(f string) string {
	best, dist := "", math.MaxInt
	for _, spec := range Builtin {
		tm, _ := ParseTemperament(spec)
		for _, form := range []string{fold(spec), fold(strings.ToLower(tm.Name()))} {
			d := typo.Distance(f, form)
			if len(f) >= 4 && strings.HasPrefix(form, f) {
				d = 1 // the start of a name: "meantone", "werck"
			}
			if d < dist {
				best, dist = spec, d
			}
		}
	}
	if dist <= max(2, len(f)/3) {
		return "did you mean " + best + "?"
	}
	return "try equal, meantone:1/4, edo:31, werckmeister3, just, or a temperament file"
}
