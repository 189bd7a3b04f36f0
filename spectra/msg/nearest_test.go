package msg

import "testing"

func TestDistance(t *testing.T) {
	for _, tt := range []struct {
		a, b string
		want int
	}{
		// The textbook example of the Levenshtein distance (from memory):
		// kitten → sitten → sittin → sitting.
		{"kitten", "sitting", 3},
		{"sitting", "kitten", 3},
		{"flaw", "lawn", 2},
		{"", "abc", 3},
		{"abc", "", 3},
		{"same", "same", 0},
		// Runes, not bytes: µ is two bytes in UTF-8.
		{"µm", "um", 1},
		{"solar_reflectence", "solar_reflectance", 1},
	} {
		if got := Distance(tt.a, tt.b); got != tt.want {
			t.Errorf("Distance(%q, %q) = %d, want %d", tt.a, tt.b, got, tt.want)
		}
	}
}

func TestName(t *testing.T) {
	names := []string{"solar_reflectance", "solar_transmittance", "thermal_emittance", "window_emittance"}
	for _, tt := range []struct {
		s, want string
		close   bool
	}{
		{"solar_reflectence", "solar_reflectance", true},
		{"Solar_Reflectance", "solar_reflectance", true}, // case is ignored
		{"thermal", "thermal_emittance", false},          // 10 edits, more than 7/3 → 2
		{"window_emmitance", "window_emittance", true},   // 2 edits
		{"wx", "window_emittance", false},
	} {
		got, close := Nearest(tt.s, names)
		if got != tt.want || close != tt.close {
			t.Errorf("Nearest(%q) = %q, %v; want %q, %v", tt.s, got, close, tt.want, tt.close)
		}
	}
	if got, close := Nearest("x", nil); got != "" || close {
		t.Errorf("no names: %q, %v", got, close)
	}
	// Ties go to the first listed.
	if got, _ := Nearest("ab", []string{"ax", "xb"}); got != "ax" {
		t.Errorf("tie: %q", got)
	}
}
