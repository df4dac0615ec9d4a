package typo

import "testing"

// Levenshtein distances worked by hand (the textbook's kitten → sitting: 3).
func TestDistance(t *testing.T) {
	for _, c := range []struct {
		a, b string
		d    int
	}{{"kitten", "sitting", 3}, {"", "abc", 3}, {"temperment", "temperament", 1}, {"same", "same", 0}} {
		if got := Distance(c.a, c.b); got != c.d {
			t.Errorf("Distance(%q, %q) = %d, want %d", c.a, c.b, got, c.d)
		}
	}
}

// A slip finds its word; another word finds none.
func TestNearest(t *testing.T) {
	words := []string{"temperament", "key", "a4", "players"}
	if w, ok := Nearest("temperment", words); !ok || w != "temperament" {
		t.Errorf("temperment: %q %v", w, ok)
	}
	if w, ok := Nearest("player", words); !ok || w != "players" {
		t.Errorf("player: %q %v", w, ok)
	}
	if w, ok := Nearest("loudness", words); ok {
		t.Errorf("loudness: took %q", w)
	}
	if w, ok := Nearest("loud", []string{"log"}); ok {
		t.Errorf("loud: took %q", w)
	}
	if _, ok := Nearest("x", nil); ok {
		t.Error("no words: a suggestion")
	}
}
