package main

import (
	"strings"
	"testing"
)

// TestTemplateEvenPolesMessage: a Butterworth of even order does work
// between equal terminations (its g_{n+1} is 1; Matthaei, Young & Jones
// 1964, sec. 4.05), so refusing --poles 4 --response butterworth with a
// reason about Chebyshev filters would mislead: the message must give the
// template's own reason (a shunt element at each end).
func TestTemplateEvenPolesMessage(t *testing.T) {
	code, _, errText := runCLI(t, "template", "lowpass", "--freq", "7.1M", "--poles", "4", "--response", "butterworth")
	if code != 2 {
		t.Fatalf("exit %d, want 2", code)
	}
	if !strings.Contains(errText, "shunt element") {
		t.Errorf("message %q does not give the template's reason", errText)
	}
}
