package publish

import (
	"bytes"
	"context"
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"sync"
	"sync/atomic"
	"testing"
	"time"
)

// holdLock takes dir's publish lock as another run would, until the
// returned function is called.
func holdLock(t *testing.T, dir string) func() {
	t.Helper()
	unlock, err := (&Writer{Dir: dir}).lockDir(context.Background())
	if err != nil {
		t.Fatal(err)
	}
	return unlock
}

// A second run computes and stages its feeds while another run holds the
// lock (so shards of one run work in parallel), waits for the lock without
// replacing anything, and commits once the lock is free.
func TestSecondRunWaitsForTheLock(t *testing.T) {
	dir := t.TempDir()
	publishTo(t, dir, "", testOptions())
	old := snapshot(t, dir)
	release := holdLock(t, dir)

	waiting := make(chan string, 1)
	done := make(chan error, 1)
	w := &Writer{Dir: dir, Waiting: func(path string) { waiting <- path }}
	go func() {
		_, err := Publish(context.Background(), Calendars(testCalendars(t, " (revised)")...), testOptions(), w)
		done <- err
	}()
	if path := <-waiting; path != filepath.Join(dir, LockName) {
		t.Errorf("waiting for %s, want the lock file in the output directory", path)
	}
	select {
	case err := <-done:
		t.Fatalf("the run finished while another held the lock: %v", err)
	default:
	}
	if n := len(tempNames(t, dir)); n != 3 {
		t.Errorf("%d feeds staged while waiting, want all 3 computed before the lock", n)
	}
	now := snapshot(t, dir)
	for name, b := range old {
		if !bytes.Equal(now[name], b) {
			t.Errorf("%s replaced while another run held the lock", name)
		}
	}
	release()
	if err := <-done; err != nil {
		t.Fatal(err)
	}
	want, err := Render(context.Background(), Calendars(testCalendars(t, " (revised)")...), testOptions())
	if err != nil {
		t.Fatal(err)
	}
	for _, f := range want.Files {
		if !bytes.Equal(snapshot(t, dir)[f.Name], f.Data) {
			t.Errorf("%s not published after the lock was released", f.Name)
		}
	}
}

// A run that cannot get the lock in LockWait gives up with a message naming
// the directory and the lock, and leaves nothing behind.
func TestLockWaitBounded(t *testing.T) {
	dir := t.TempDir()
	publishTo(t, dir, "", testOptions())
	old := snapshot(t, dir)
	defer holdLock(t, dir)()
	w := &Writer{Dir: dir, LockWait: time.Millisecond}
	_, err := Publish(context.Background(), Calendars(testCalendars(t, " (revised)")...), testOptions(), w)
	if !errors.Is(err, ErrLocked) {
		t.Fatalf("error %v, want ErrLocked", err)
	}
	for _, want := range []string{"output directory " + dir, "locked by another publish", LockName, "; " + nothingChanged} {
		if !strings.Contains(err.Error(), want) {
			t.Errorf("message %q does not say %q", err, want)
		}
	}
	if tmp := tempNames(t, dir); len(tmp) > 0 {
		t.Errorf("temporary files left: %v", tmp)
	}
	now := snapshot(t, dir)
	for name, b := range old {
		if !bytes.Equal(now[name], b) {
			t.Errorf("%s changed by a run that never got the lock", name)
		}
	}
}

// A feed found up to date when it was staged but replaced by another run
// before this one commits is rendered again: the run never lists bytes it
// has not checked.
func TestCommitRechecksFeedsReplacedMeanwhile(t *testing.T) {
	dir := t.TempDir()
	publishTo(t, dir, "", testOptions())
	other, err := Render(context.Background(), Calendars(testCalendars(t, " (revised)")...), testOptions())
	if err != nil {
		t.Fatal(err)
	}
	release := holdLock(t, dir)
	waiting := make(chan string, 1)
	done := make(chan Stats, 1)
	w := &Writer{Dir: dir, Waiting: func(path string) { waiting <- path }}
	go func() {
		st, err := Publish(context.Background(), Calendars(testCalendars(t, "")...), testOptions(), w)
		if err != nil {
			t.Error(err)
		}
		done <- st
	}()
	// The run has found every feed up to date and waits for the lock;
	// another run now replaces one of them.
	<-waiting
	name := "orchard-sunset.ics"
	tmp := filepath.Join(dir, ".other-run")
	if err := os.WriteFile(tmp, other.File(name).Data, 0o644); err != nil {
		t.Fatal(err)
	}
	if err := os.Rename(tmp, filepath.Join(dir, name)); err != nil {
		t.Fatal(err)
	}
	release()
	st := <-done
	if st.FeedsWritten != 1 {
		t.Errorf("feeds written %d, want the one replaced meanwhile", st.FeedsWritten)
	}
	if bad, n := listedMismatches(t, dir); len(bad) > 0 || n != 3 {
		t.Errorf("feeds.json lists %d feeds; mismatches: %v", n, bad)
	}
}

// Runs of different revisions racing into one directory end with one
// revision complete and a true feeds.json: the last commit's.
func TestConcurrentRunsEndConsistent(t *testing.T) {
	dir := t.TempDir()
	revs := []string{"", " (revised)", " (third edition)"}
	var wg sync.WaitGroup
	for g := range 4 {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for i := range 3 {
				rev := revs[(g+i)%len(revs)]
				if _, err := Publish(context.Background(), Calendars(testCalendars(t, rev)...), testOptions(), &Writer{Dir: dir}); err != nil {
					t.Error(err)
				}
			}
		}()
	}
	wg.Wait()
	if bad, n := listedMismatches(t, dir); len(bad) > 0 || n != 3 {
		t.Fatalf("feeds.json lists %d feeds; mismatches: %v", n, bad)
	}
	now := snapshot(t, dir)
	for _, rev := range revs {
		b, err := Render(context.Background(), Calendars(testCalendars(t, rev)...), testOptions())
		if err != nil {
			t.Fatal(err)
		}
		if bytes.Equal(now[FeedsJSONName], b.File(FeedsJSONName).Data) {
			for _, f := range b.Files {
				if !bytes.Equal(now[f.Name], f.Data) {
					t.Errorf("%s is not of the revision feeds.json describes (%q)", f.Name, rev)
				}
			}
			return
		}
	}
	t.Error("feeds.json is none of the revisions'")
}

// Shards of different configurations (or shard counts) never share a
// directory while one of their runs is unfinished; a finished run, or one
// abandoned for longer than RunMaxAge, gives way.
func TestMixedConfigurationsRefused(t *testing.T) {
	dir := t.TempDir()
	shard := func(config string, i, n int, w *Writer) error {
		opts := testOptions()
		opts.Configuration = config
		opts.Shard = Shard{Index: i, Count: n}
		_, err := Publish(context.Background(), Calendars(testCalendars(t, " "+config)...), opts, w)
		return err
	}
	if err := shard("spring", 0, 2, &Writer{Dir: dir}); err != nil {
		t.Fatal(err)
	}
	before := snapshot(t, dir)
	for _, tc := range []struct {
		name   string
		config string
		i, n   int
		want   string
	}{
		{"another configuration", "summer", 1, 2, "unfinished sharded run of another configuration (1 of 2 shards done"},
		{"another shard count", "spring", 1, 3, "unfinished sharded run of this configuration split into 2 shards"},
		{"a whole run", "spring", 0, 1, "with this whole run"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			err := shard(tc.config, tc.i, tc.n, &Writer{Dir: dir})
			if !errors.Is(err, ErrMixedRuns) {
				t.Fatalf("error %v, want ErrMixedRuns", err)
			}
			for _, want := range []string{tc.want, "feeds-0-of-2.json", "refusing to mix two configurations in one directory", "; " + nothingChanged} {
				if !strings.Contains(err.Error(), want) {
					t.Errorf("message %q does not say %q", err, want)
				}
			}
			now := snapshot(t, dir)
			for name, b := range before {
				if !bytes.Equal(now[name], b) {
					t.Errorf("%s changed by a refused run", name)
				}
			}
			if len(now) != len(before) {
				t.Errorf("files %v, then %v", keys(before), keys(now))
			}
		})
	}
	// Once the other run is older than RunMaxAge it is taken as abandoned:
	// its manifests go, and the new run publishes.
	later := &Writer{Dir: dir, now: func() time.Time { return time.Now().Add(DefaultRunMaxAge + time.Minute) }}
	if err := shard("summer", 1, 2, later); err != nil {
		t.Fatal(err)
	}
	if _, err := os.Stat(filepath.Join(dir, ManifestName(Shard{0, 2}))); err == nil {
		t.Error("the abandoned run's manifest is still there")
	}
	if bad, _ := listedMismatches(t, dir); len(bad) > 0 {
		t.Errorf("feeds.json: %v", bad)
	}
	// Finishing a run frees the directory at once.
	if err := shard("summer", 0, 2, &Writer{Dir: dir}); err != nil {
		t.Fatal(err)
	}
	if err := shard("autumn", 0, 1, &Writer{Dir: dir}); err != nil {
		t.Errorf("a whole run after a finished sharded one: %v", err)
	}
	for i := range 2 {
		if _, err := os.Stat(filepath.Join(dir, ManifestName(Shard{i, 2}))); err == nil {
			t.Error(fmt.Sprintf("the finished run's manifest %d is still there after a whole run", i))
		}
	}
	if bad, n := listedMismatches(t, dir); len(bad) > 0 || n != 3 {
		t.Errorf("feeds.json lists %d feeds; mismatches %v", n, bad)
	}
}

// Runs start, look for a killed run's leftovers and end at once in one
// directory: a run finds itself alone (liveLock.alone, under the
// directory's lock) only while no other run holds its live lock, whatever
// the moments at which a run ending removes LiveName and another starting
// opens it. A run is counted alive from its holdLive to its look, after
// which it writes only under the directory's lock.
func TestLiveLockAloneOnlyWhenAlone(t *testing.T) {
	dir := t.TempDir()
	var (
		alive, alone atomic.Int32
		dirLock      sync.Mutex // the directory's lock (lockDir) that alone's caller holds
		wg           sync.WaitGroup
	)
	for range 4 {
		wg.Add(1)
		go func() {
			defer wg.Done()
			w := &Writer{Dir: dir} // a file description of its own, as another process has
			for range 200 {
				l, err := w.holdLive(context.Background())
				if err != nil {
					t.Error(err)
					return
				}
				alive.Add(1)
				dirLock.Lock()
				if l.alone(func() {
					if n := alive.Load(); n != 1 {
						t.Errorf("a run found itself alone beside %d other runs alive", n-1)
					}
				}) {
					alone.Add(1)
				}
				alive.Add(-1)
				dirLock.Unlock()
				l.release()
			}
		}()
	}
	wg.Wait()
	l, err := (&Writer{Dir: dir}).holdLive(context.Background())
	if err != nil {
		t.Fatal(err)
	}
	if !l.alone(func() {}) {
		t.Error("a run after all the others ended does not find itself alone")
	}
	l.release()
	t.Logf("%d of 800 looks found their run alone", alone.Load())
	if _, err := os.Stat(filepath.Join(dir, LiveName)); !errors.Is(err, os.ErrNotExist) {
		t.Errorf("the last run out left %s (%v)", LiveName, err)
	}
}
