package publish

import (
	"bufio"
	"bytes"
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"io/fs"
	"math/rand/v2"
	"os"
	"os/exec"
	"path/filepath"
	"slices"
	"strconv"
	"strings"
	"sync"
	"testing"
	"time"
)

// The revisions the kill test publishes in turn: each changes every feed.
var killRevisions = []string{"", " (revised)", " (third edition)"}

// Environment of the child process of TestKilledPublishKeepsListingTrue.
const (
	killDirEnv   = "HELIOCAL_PUBLISH_KILL_DIR"
	killAtEnv    = "HELIOCAL_PUBLISH_KILL_AT"    // stop at this point; "loop": publish forever
	killRevEnv   = "HELIOCAL_PUBLISH_KILL_REV"   // index into killRevisions
	killShardEnv = "HELIOCAL_PUBLISH_KILL_SHARD" // i/n, or empty for a whole run
)

// stallingFile writes half of the data, tells the parent test, and hangs:
// the moment a real crash or kill would leave a half-written file.
type stallingFile struct {
	*os.File
	point int
}

func (f stallingFile) Write(p []byte) (int, error) {
	n, err := f.File.Write(p[:len(p)/2])
	if err == nil {
		err = f.File.Sync()
	}
	fmt.Printf("stopped at point %d: half-way through %s (%v)\n", f.point, f.Name(), err)
	time.Sleep(time.Minute) // the parent kills us long before
	os.Exit(3)
	return n, err
}

// stoppingWriter counts the points of a publish at which a kill can land
// (every temporary file being written; every rename and removal of the
// commit, and the keeping of each file it replaces or removes) and, at
// point at, reports it on stdout and hangs.
func stoppingWriter(dir string, at int) (*Writer, *int) {
	point := 0
	var mu sync.Mutex // the workers create their temporary files concurrently
	w := &Writer{Dir: dir}
	w.step = func(what string) {
		mu.Lock()
		defer mu.Unlock()
		point++
		if point == at {
			fmt.Printf("stopped at point %d: before %s\n", point, what)
			time.Sleep(time.Minute)
			os.Exit(3)
		}
	}
	w.createTemp = func(dir, pattern string) (tempFile, error) {
		f, err := os.CreateTemp(dir, pattern)
		if err != nil {
			return nil, err
		}
		mu.Lock()
		defer mu.Unlock()
		point++
		if point == at {
			return stallingFile{f, point}, nil
		}
		return f, nil
	}
	return w, &point
}

// killChild is the publishing process the test kills.
func killChild(t *testing.T, dir string) {
	rev, _ := strconv.Atoi(os.Getenv(killRevEnv))
	if os.Getenv(killAtEnv) == "loop" {
		fmt.Println("looping")
		for i := rev; ; i++ {
			r := killRevisions[i%len(killRevisions)]
			if _, err := Publish(context.Background(), Calendars(testCalendars(t, r)...), testOptions(), &Writer{Dir: dir}); err != nil {
				t.Fatal(err)
			}
		}
	}
	at, _ := strconv.Atoi(os.Getenv(killAtEnv))
	w, _ := stoppingWriter(dir, at)
	opts := testOptions()
	if sh := os.Getenv(killShardEnv); sh != "" {
		var err error
		if opts.Shard, err = ParseShard(sh); err != nil {
			t.Fatal(err)
		}
	}
	_, err := Publish(context.Background(), Calendars(testCalendars(t, killRevisions[rev])...), opts, w)
	fmt.Printf("finished: %v\n", err)
	os.Exit(0)
}

// A publish killed with SIGKILL (no chance to clean up) at any point — while
// a feed is half-written, before any rename of the commit, or at a random
// instant of a run, alone or while a second run publishes into the same
// directory — leaves every file complete (some revision's bytes), and
// feeds.json true: every file it lists is on disk with the listed size and
// SHA-256. The next run completes the job.
func TestKilledPublishKeepsListingTrue(t *testing.T) {
	if dir := os.Getenv(killDirEnv); dir != "" {
		killChild(t, dir)
		return
	}
	seed := time.Now().UnixNano()
	if s := os.Getenv("HELIOCAL_KILL_SEED"); s != "" {
		seed, _ = strconv.ParseInt(s, 10, 64)
	}
	t.Logf("seed %d (HELIOCAL_KILL_SEED reruns it)", seed)
	rng := rand.New(rand.NewPCG(uint64(seed), 1))

	// Every version a file may have: the bytes of each revision.
	versions := map[string][][]byte{}
	for _, rev := range killRevisions {
		b, err := Render(context.Background(), Calendars(testCalendars(t, rev)...), testOptions())
		if err != nil {
			t.Fatal(err)
		}
		for _, f := range b.Files {
			versions[f.Name] = append(versions[f.Name], f.Data)
		}
	}
	// The points of one run over another revision's files.
	scratch := t.TempDir()
	publishTo(t, scratch, killRevisions[0], testOptions())
	w, counted := stoppingWriter(scratch, -1)
	if _, err := Publish(context.Background(), Calendars(testCalendars(t, killRevisions[1])...), testOptions(), w); err != nil {
		t.Fatal(err)
	}
	points := *counted
	t.Logf("a run has %d points a kill can stop it at", points)

	dir := t.TempDir()
	whole := dir
	publishTo(t, dir, killRevisions[0], testOptions())
	start := func(env ...string) (*exec.Cmd, *bufio.Scanner) { return startKillChild(t, dir, env...) }
	// waitFor reads the child's output up to a line with one of the prefixes.
	waitFor := func(sc *bufio.Scanner, prefixes ...string) string {
		for sc.Scan() {
			for _, p := range prefixes {
				if strings.HasPrefix(sc.Text(), p) {
					return sc.Text()
				}
			}
		}
		return ""
	}

	const trials = 40
	stopped := map[string]int{}
	last := 0
	for trial := range trials {
		// Another revision than the last one asked for, so that most runs
		// have files to replace.
		last = (last + 1 + rng.IntN(len(killRevisions)-1)) % len(killRevisions)
		rev := strconv.Itoa(last)
		var what string
		switch mode := trial % 4; mode {
		case 0, 1: // at a chosen point
			at := 1 + rng.IntN(points)
			cmd, sc := start(killAtEnv+"="+strconv.Itoa(at), killRevEnv+"="+rev)
			what = waitFor(sc, "stopped", "finished")
			cmd.Process.Kill()
			cmd.Wait()
			if strings.HasPrefix(what, "finished") {
				// The revision was on disk already: nothing to replace.
				what = "finished before point " + strconv.Itoa(at)
			}
			switch {
			case strings.Contains(what, "half-way"):
				stopped["mid-write"]++
			case strings.Contains(what, "before rename"):
				stopped["before a rename"]++
			case strings.Contains(what, "before remove"):
				stopped["before a removal"]++
			case strings.Contains(what, "before keep"):
				stopped["before keeping a replaced file"]++
			default:
				stopped["after the end"]++
			}
		case 2: // at a random instant of runs in a loop
			cmd, sc := start(killAtEnv+"=loop", killRevEnv+"="+rev)
			waitFor(sc, "looping")
			time.Sleep(time.Duration(rng.IntN(40_000)) * time.Microsecond)
			cmd.Process.Kill()
			cmd.Wait()
			what = "a random instant"
			stopped["random"]++
		case 3: // at a chosen point while a second run publishes another revision
			at := 1 + rng.IntN(points)
			other := strconv.Itoa((rng.IntN(len(killRevisions)-1) + 1 + mustAtoi(rev)) % len(killRevisions))
			cmd, sc := start(killAtEnv+"="+strconv.Itoa(at), killRevEnv+"="+rev)
			second, sc2 := start(killAtEnv+"=0", killRevEnv+"="+other)
			what = waitFor(sc, "stopped", "finished")
			cmd.Process.Kill()
			cmd.Wait()
			if done := waitFor(sc2, "finished"); done != "finished: <nil>" {
				t.Errorf("trial %d: the second run: %q", trial, done)
			}
			second.Wait()
			last = mustAtoi(other)
			what = "two runs, one " + what
			stopped["concurrent"]++
		}

		now := snapshot(t, dir)
		for name, b := range now {
			if strings.Contains(name, ".tmp-") || name == FeedsJSONName {
				continue
			}
			ok := false
			for _, v := range versions[name] {
				ok = ok || bytes.Equal(b, v)
			}
			if !ok {
				t.Errorf("trial %d (%s): %s is not a complete version (%d bytes)", trial, what, name, len(b))
			}
		}
		var fj feedsJSON
		if err := json.Unmarshal(now[FeedsJSONName], &fj); err != nil {
			t.Errorf("trial %d (%s): feeds.json: %v", trial, what, err)
		}
		if bad, _ := listedMismatches(t, dir); len(bad) > 0 {
			t.Errorf("trial %d (killed %s): feeds.json lists files that are not on disk as listed:\n%s", trial, what, strings.Join(bad, "\n"))
		}
	}
	t.Logf("kills: %v", stopped)

	// Shards of one run into a second directory, killed at chosen points:
	// feeds.json and every shard manifest stay true.
	sharded := t.TempDir()
	for i := range 2 {
		opts := testOptions()
		opts.Shard = Shard{Index: i, Count: 2}
		publishTo(t, sharded, killRevisions[0], opts)
	}
	dir = sharded
	for trial := range 12 {
		last = (last + 1 + rng.IntN(len(killRevisions)-1)) % len(killRevisions)
		shard := fmt.Sprintf("%d/2", rng.IntN(2))
		at := 1 + rng.IntN(points)
		cmd, sc := start(killAtEnv+"="+strconv.Itoa(at), killRevEnv+"="+strconv.Itoa(last), killShardEnv+"="+shard)
		what := waitFor(sc, "stopped", "finished")
		cmd.Process.Kill()
		cmd.Wait()
		if strings.HasPrefix(what, "finished") && what != "finished: <nil>" {
			t.Fatalf("sharded trial %d: shard %s %s", trial, shard, what)
		}
		for _, name := range append([]string{FeedsJSONName}, ManifestName(Shard{0, 2}), ManifestName(Shard{1, 2})) {
			if bad := listedMismatchesIn(t, sharded, name); len(bad) > 0 {
				t.Errorf("sharded trial %d (shard %s killed: %s): %s lists files that are not on disk as listed:\n%s",
					trial, shard, what, name, strings.Join(bad, "\n"))
			}
		}
	}
	for i := range 2 {
		opts := testOptions()
		opts.Shard = Shard{Index: i, Count: 2}
		publishTo(t, sharded, killRevisions[1], opts)
	}
	if bad, n := listedMismatches(t, sharded); len(bad) > 0 || n != 3 {
		t.Errorf("after both shards ran again feeds.json lists %d feeds, mismatches %v", n, bad)
	}

	// The next night: leftovers are old enough to be removed, and the run
	// completes the job.
	w = &Writer{Dir: whole, now: func() time.Time { return time.Now().Add(DefaultTempMaxAge + time.Minute) }}
	if _, err := Publish(context.Background(), Calendars(testCalendars(t, killRevisions[1])...), testOptions(), w); err != nil {
		t.Fatal(err)
	}
	if tmp := tempNames(t, whole); len(tmp) != 0 {
		t.Errorf("leftovers not removed: %v", tmp)
	}
	want, err := Render(context.Background(), Calendars(testCalendars(t, killRevisions[1])...), testOptions())
	if err != nil {
		t.Fatal(err)
	}
	for _, f := range want.Files {
		if !bytes.Equal(snapshot(t, whole)[f.Name], f.Data) {
			t.Errorf("%s not completed by the next run", f.Name)
		}
	}
	if bad, n := listedMismatches(t, whole); len(bad) > 0 || n != 3 {
		t.Errorf("after the next run feeds.json lists %d feeds, mismatches %v", n, bad)
	}
}

func mustAtoi(s string) int {
	n, err := strconv.Atoi(s)
	if err != nil {
		panic(err)
	}
	return n
}

// startKillChild starts a publishing process into dir that the test kills
// (killChild), with the settings env, and returns it with its output.
func startKillChild(t *testing.T, dir string, env ...string) (*exec.Cmd, *bufio.Scanner) {
	t.Helper()
	cmd := exec.Command(os.Args[0], "-test.run=^TestKilledPublishKeepsListingTrue$", "-test.count=1")
	cmd.Env = append(append(os.Environ(), killDirEnv+"="+dir), env...)
	out, err := cmd.StdoutPipe()
	if err != nil {
		t.Fatal(err)
	}
	cmd.Stderr = os.Stderr
	if err := cmd.Start(); err != nil {
		t.Fatal(err)
	}
	return cmd, bufio.NewScanner(out)
}

// A publish killed with SIGKILL leaves its temporary files; the next
// publish removes them as soon as it holds the directory's lock, however
// young, since no other run is alive (LiveName proves it). While their run
// is alive, its files are kept.
func TestKilledRunsTemporaryFilesRemovedByTheNext(t *testing.T) {
	dir := t.TempDir()
	publishTo(t, dir, killRevisions[0], testOptions())
	cmd, sc := startKillChild(t, dir, killAtEnv+"=1", killRevEnv+"=1")
	defer func() { cmd.Process.Kill(); cmd.Wait() }()
	for sc.Scan() && !strings.HasPrefix(sc.Text(), "stopped at point 1") {
	}
	alive := tempNames(t, dir)
	if len(alive) == 0 {
		t.Fatal("the stopped run has written no temporary file")
	}
	if st := publishTo(t, dir, killRevisions[2], testOptions()); st.TempRemoved != 0 {
		t.Errorf("a run beside a live one removed %d temporary files, want 0", st.TempRemoved)
	}
	kept := tempNames(t, dir)
	for _, name := range alive {
		if !slices.Contains(kept, name) {
			t.Errorf("%s of the live run removed", name)
		}
	}

	cmd.Process.Kill()
	cmd.Wait()
	left := tempNames(t, dir)
	if _, err := os.Stat(filepath.Join(dir, LiveName)); err != nil {
		t.Errorf("the killed run left no %s: %v", LiveName, err)
	}
	st := publishTo(t, dir, killRevisions[2], testOptions())
	if now := tempNames(t, dir); len(now) != 0 || st.TempRemoved != len(left) {
		t.Errorf("the next run removed %d of the killed run's %d temporary files, left %v", st.TempRemoved, len(left), now)
	}
	if _, err := os.Stat(filepath.Join(dir, LiveName)); !errors.Is(err, fs.ErrNotExist) {
		t.Errorf("the next run, the last one out, left %s (%v)", LiveName, err)
	}
}
