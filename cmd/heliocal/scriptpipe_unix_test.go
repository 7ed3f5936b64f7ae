//go:build unix

package main

import (
	"bytes"
	"errors"
	"io"
	"os"
	"os/exec"
	"path/filepath"
	"syscall"
	"testing"
)

// What the README's "For scripts" promises of a listing whose standard
// output goes away, through the built binary: a reader that closes the
// pipe (`| head`) ends it by SIGPIPE, silently (the shell's status 141,
// 128 + 13), and standard output that cannot be written (/dev/full: no
// room) is an error, exit 1, in one line.
func TestEventsStdoutGone(t *testing.T) {
	if testing.Short() {
		t.Skip("builds the binary")
	}
	bin := filepath.Join(t.TempDir(), "heliocal")
	if out, err := exec.Command("go", "build", "-o", bin, ".").CombinedOutput(); err != nil {
		t.Fatalf("go build: %v\n%s", err, out)
	}
	// twenty years of sunrises in CSV, far more than a pipe holds
	args := []string{"events", "--lat", "48.21", "--lon", "16.37", "--tz", "Europe/Vienna", "--kinds", "sunrise",
		"--from", "2027-01-01", "--to", "2046-12-31", "--format", "csv"}

	cmd := exec.Command(bin, args...)
	cmd.Dir = t.TempDir()
	var errOut bytes.Buffer
	cmd.Stderr = &errOut
	out, err := cmd.StdoutPipe()
	if err != nil {
		t.Fatal(err)
	}
	if err := cmd.Start(); err != nil {
		t.Fatal(err)
	}
	if _, err := io.ReadFull(out, make([]byte, 100)); err != nil { // the header and a row, as head reads them
		t.Fatal(err)
	}
	out.Close()
	err = cmd.Wait()
	var ee *exec.ExitError
	ws, ok := cmd.ProcessState.Sys().(syscall.WaitStatus)
	if !errors.As(err, &ee) || !ok || !ws.Signaled() || ws.Signal() != syscall.SIGPIPE || errOut.Len() != 0 {
		t.Errorf("a closed pipe: %v, standard error %q; want the end by SIGPIPE and nothing said", err, errOut.String())
	}

	full, err := os.OpenFile("/dev/full", os.O_WRONLY, 0)
	if err != nil {
		t.Skipf("no /dev/full: %v", err)
	}
	defer full.Close()
	cmd = exec.Command(bin, args...)
	cmd.Dir = t.TempDir()
	errOut.Reset()
	cmd.Stdout, cmd.Stderr = full, &errOut
	err = cmd.Run()
	if want := "heliocal: write /dev/stdout: no space left on device\n"; cmd.ProcessState.ExitCode() != exitFailure || errOut.String() != want {
		t.Errorf("/dev/full: %v, exit %d, standard error %q; want exit %d and %q", err, cmd.ProcessState.ExitCode(), errOut.String(), exitFailure, want)
	}
}
