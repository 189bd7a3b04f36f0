package main

import (
	"io"
	"net/http"
	"net/http/httptest"
	"strings"
	"testing"
)

// TestPreviewHostHeader checks that the preview answers only requests that
// name the loopback interface (DNS-rebinding protection).
func TestPreviewHostHeader(t *testing.T) {
	lib := copyLibrary(t)
	s := &preview{dir: lib, version: "test", log: io.Discard}
	s.rerender()
	ts := httptest.NewServer(s)
	defer ts.Close()
	for _, tc := range []struct {
		host string
		code int
	}{
		{ts.Listener.Addr().String(), 200},
		{"localhost:8080", 200},
		{"LOCALHOST", 200},
		{"127.0.0.1", 200},
		{"[::1]:8080", 200},
		{"evil.example:8080", http.StatusMisdirectedRequest},
		{"127.0.0.1.evil.example", http.StatusMisdirectedRequest},
		{"localhost.evil.example:8080", http.StatusMisdirectedRequest},
		{"10.0.0.1:8080", http.StatusMisdirectedRequest},
	} {
		req, _ := http.NewRequest("GET", ts.URL+"/", nil)
		req.Host = tc.host
		resp, err := ts.Client().Do(req)
		if err != nil {
			t.Fatal(err)
		}
		body, _ := io.ReadAll(resp.Body)
		resp.Body.Close()
		if resp.StatusCode != tc.code {
			t.Errorf("Host %q: %d, want %d", tc.host, resp.StatusCode, tc.code)
		}
		if tc.code != 200 && (strings.Contains(string(body), "Northfield") || !strings.Contains(string(body), "only requests for localhost")) {
			t.Errorf("Host %q: body %q", tc.host, body)
		}
	}
}
