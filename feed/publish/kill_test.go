package publish

import (
	"bufio"
	"bytes"
	"context"
	"fmt"
	"os"
	"os/exec"
	"strings"
	"testing"
	"time"
)

// stallingFile writes half of the data, tells the parent test, and hangs:
// the moment a real crash or kill would leave a half-written file.
type stallingFile struct{ *os.File }

func (f stallingFile) Write(p []byte) (int, error) {
	n, err := f.File.Write(p[:len(p)/2])
	if err == nil {
		err = f.File.Sync()
	}
	fmt.Printf("stalled in %s after %d bytes\n", f.Name(), n)
	time.Sleep(time.Minute) // the parent kills us long before
	os.Exit(3)
	return n, err
}

// A publish killed (SIGKILL, no chance to clean up) while it is half-way
// through a feed leaves every published file intact and readable; the next
// run removes its leftover and completes the job.
func TestKilledPublishLeavesFilesIntact(t *testing.T) {
	if dir := os.Getenv("HELIOCAL_PUBLISH_KILL_DIR"); dir != "" {
		calls := 0
		w := &Writer{Dir: dir, createTemp: func(dir, pattern string) (tempFile, error) {
			f, err := os.CreateTemp(dir, pattern)
			calls++
			if err != nil || calls != 2 {
				return f, err
			}
			return stallingFile{f}, nil
		}}
		_, err := Publish(context.Background(), Calendars(testCalendars(t, " (revised)")...), testOptions(), w)
		t.Fatalf("the child publish returned (%v) instead of stalling", err)
	}

	dir := t.TempDir()
	publishTo(t, dir, "", testOptions())
	old := snapshot(t, dir)

	cmd := exec.Command(os.Args[0], "-test.run=^TestKilledPublishLeavesFilesIntact$", "-test.count=1")
	cmd.Env = append(os.Environ(), "HELIOCAL_PUBLISH_KILL_DIR="+dir)
	out, err := cmd.StdoutPipe()
	if err != nil {
		t.Fatal(err)
	}
	cmd.Stderr = os.Stderr
	if err := cmd.Start(); err != nil {
		t.Fatal(err)
	}
	sc := bufio.NewScanner(out)
	stalled := ""
	for sc.Scan() {
		if strings.HasPrefix(sc.Text(), "stalled in ") {
			stalled = sc.Text()
			break
		}
	}
	if err := cmd.Process.Kill(); err != nil {
		t.Fatal(err)
	}
	cmd.Wait()
	if stalled == "" {
		t.Fatal("the child never reached the second feed")
	}
	t.Log("killed child: " + stalled)

	newBundle, err := Render(context.Background(), Calendars(testCalendars(t, " (revised)")...), testOptions())
	if err != nil {
		t.Fatal(err)
	}
	now := snapshot(t, dir)
	replaced := 0
	for name, b := range old {
		switch {
		case bytes.Equal(now[name], b):
		case bytes.Equal(now[name], newBundle.File(name).Data):
			replaced++
		default:
			t.Errorf("%s is neither the published file nor the new one after the kill", name)
		}
	}
	if replaced != 1 {
		t.Errorf("%d files replaced before the kill, want 1 (the first feed)", replaced)
	}
	for _, name := range []string{"feeds.json", "index.html"} {
		if !bytes.Equal(now[name], old[name]) {
			t.Errorf("%s replaced although the feeds were not all written", name)
		}
	}
	leftovers := tempNames(t, dir)
	if len(leftovers) != 1 {
		t.Fatalf("leftover temporary files %v, want the one being written", leftovers)
	}

	// The next night: the leftover is old enough to be ours for sure.
	w := &Writer{Dir: dir, now: func() time.Time { return time.Now().Add(DefaultTempMaxAge + time.Minute) }}
	st, err := Publish(context.Background(), Calendars(testCalendars(t, " (revised)")...), testOptions(), w)
	if err != nil {
		t.Fatal(err)
	}
	if st.TempRemoved != 1 || len(tempNames(t, dir)) != 0 {
		t.Errorf("leftover not removed: %+v, %v", st, tempNames(t, dir))
	}
	for _, f := range newBundle.Files {
		if !bytes.Equal(snapshot(t, dir)[f.Name], f.Data) {
			t.Errorf("%s not completed by the next run", f.Name)
		}
	}
}
