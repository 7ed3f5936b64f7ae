package main

import (
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
	"strings"
	"syscall"
	"testing"

	"heliocal/feed/publish"
)

// A publish that cannot write into its output directory names the
// directory and the flag or key it came from, with a hint, not the
// temporary file or lock file it tried first; it stays a run-time failure
// (exit 1, as the help's EXIT STATUS says of a file that cannot be
// written), and errors.Is still finds the system's error. The errors are
// those the publish returns (feed/publish: writeTemp, lock, prepare's
// MkdirAll, endUndo), with the errno of a directory without write
// permission (EACCES), of a read-only file system (EROFS), of a full disk
// (ENOSPC) and of an exhausted quota (EDQUOT).
func TestOutDirFailedWords(t *testing.T) {
	pathErr := func(op, path string, errno syscall.Errno) error { return &fs.PathError{Op: op, Path: path, Err: errno} }
	for _, tc := range []struct {
		name, field, out string
		err              error
		want             string
	}{
		{"temporary file", "--out", "ro",
			fmt.Errorf("publish: write farm-sun.ics: %w", pathErr("open", filepath.Join("ro", ".farm-sun.ics.tmp-1792958586"), syscall.EACCES)),
			`--out: "ro": cannot write into it (permission denied; give a directory this user may write to, or change its permissions)`},
		{"lock file", "service.out_dir", "public",
			fmt.Errorf("publish: lock %[1]s: %[2]w", filepath.Join("public", ".heliocal-publish.lock"), pathErr("open", filepath.Join("public", ".heliocal-publish.lock"), syscall.EACCES)),
			`service.out_dir: "public": cannot write into it (permission denied; give a directory this user may write to, or change its permissions)`},
		{"directory not created", "--out", filepath.Join("srv", "sky", "feeds"),
			fmt.Errorf("publish: output directory: %w", pathErr("mkdir", filepath.Join("srv", "sky"), syscall.EACCES)),
			`--out: "` + filepath.Join("srv", "sky", "feeds") + `": cannot create it (permission denied; give a directory this user may write to, or change its permissions)`},
		{"read-only file system", "--out", "/mnt/sky",
			fmt.Errorf("publish: write farm-sun.ics: %w", pathErr("open", "/mnt/sky/.farm-sun.ics.tmp-1", syscall.EROFS)),
			`--out: "/mnt/sky": cannot write into it (read-only file system; give a directory on a file system that can be written)`},
		{"nothing can be created in it", "--out", "/proc/1",
			fmt.Errorf("publish: write farm-sun.ics: %w", pathErr("open", "/proc/1/.farm-sun.ics.tmp-2115824124", syscall.ENOENT)),
			`--out: "/proc/1": cannot create a file in it (no such file or directory; give a directory on an ordinary file system, where files can be created)`},
		{"nor under it", "--out", "/proc/1/sky",
			fmt.Errorf("publish: output directory: %w", pathErr("mkdir", "/proc/1/sky", syscall.ENOENT)),
			`--out: "/proc/1/sky": cannot create it (no such file or directory; give a directory on an ordinary file system, where files can be created)`},
		{"what was kept", "--out", "sky",
			fmt.Errorf("%w; nothing was changed: the files published before are as they were",
				fmt.Errorf("publish: %w", pathErr("replace", filepath.Join("sky", "farm-sun.ics"), syscall.EPERM))),
			`--out: "sky": cannot write into it (operation not permitted; give a directory this user may write to, or change its permissions); nothing was changed: the files published before are as they were`},
		{"full disk", "--out", "sky",
			fmt.Errorf("%w; nothing was changed: the files published before are as they were",
				&publish.DiskFullError{Dir: "sky", File: "farm-sun.ics", Err: pathErr("write", filepath.Join("sky", ".farm-sun.ics.tmp-1"), syscall.ENOSPC)}),
			`--out: "sky": no room for farm-sun.ics (no space left on device; free some space on its file system, or give a directory on another); nothing was changed: the files published before are as they were`},
		{"quota", "service.out_dir", "public",
			&publish.DiskFullError{Dir: "public", File: "feeds.json", Err: pathErr("open", filepath.Join("public", ".feeds.json.tmp-*"), syscall.EDQUOT)},
			`service.out_dir: "public": no room for feeds.json (disk quota exceeded; free some space on its file system, or give a directory on another)`},
	} {
		t.Run(tc.name, func(t *testing.T) {
			err := outDirFailed(tc.field, tc.out, tc.err)
			if err.Error() != tc.want {
				t.Errorf("message\n%s\nwant\n%s", err, tc.want)
			}
			if code := exitCode(err); code != exitFailure {
				t.Errorf("exit %d, want %d", code, exitFailure)
			}
			if !errors.Is(err, tc.err) {
				t.Errorf("%v does not unwrap to the publish's error", err)
			}
		})
	}
	// another error of the system, a file outside the directory, or a
	// missing file below it, is said as it was
	for _, err := range []error{
		fmt.Errorf("publish: write farm-sun.ics: %w", pathErr("write", filepath.Join("sky", ".farm-sun.ics.tmp-1"), syscall.EIO)),
		fmt.Errorf("publish: %w", pathErr("open", filepath.Join("elsewhere", "x"), syscall.EACCES)),
		fmt.Errorf("publish: %w", pathErr("open", filepath.Join("sky", "sub", "x"), syscall.ENOENT)),
	} {
		if got := outDirFailed("--out", "sky", err); got != err {
			t.Errorf("%v worded again as %v", err, got)
		}
	}
}

// A file already in the output directory that the user may not open (the
// lock file, or a feed, left by a publish run as another user; the
// directory itself is writable) is named, not the directory, which the
// user would find writable: the errors are those the publish returns when
// the lock file (lockDir) or a published feed (fileEquals) cannot be
// opened. A file the publish would create, which is not there, still
// names the directory.
func TestOutDirFailedNamesAFileThere(t *testing.T) {
	out := t.TempDir()
	for _, name := range []string{publish.LockName, "farm-sun.ics"} {
		if err := os.WriteFile(filepath.Join(out, name), nil, 0o600); err != nil {
			t.Fatal(err)
		}
	}
	pathErr := func(name string) error {
		return &fs.PathError{Op: "open", Path: filepath.Join(out, name), Err: syscall.EACCES}
	}
	for _, tc := range []struct {
		err  error
		want string
	}{
		{fmt.Errorf("publish: lock %s: %w", filepath.Join(out, publish.LockName), pathErr(publish.LockName)),
			`--out: "` + out + `": cannot open .heliocal-publish.lock in it (permission denied; this user may not: change the file's owner or permissions, or remove it, and publish writes it again)`},
		{fmt.Errorf("publish: %w", pathErr("farm-sun.ics")),
			`--out: "` + out + `": cannot open farm-sun.ics in it (permission denied; this user may not: change the file's owner or permissions, or remove it, and publish writes it again)`},
		{fmt.Errorf("publish: write farm-moon.ics: %w", pathErr(".farm-moon.ics.tmp-1")),
			`--out: "` + out + `": cannot write into it (permission denied; give a directory this user may write to, or change its permissions)`},
		// a commit's rename over a feed the user may not replace (another
		// user's in a sticky directory, an immutable one), as the writer's
		// install returns it
		{fmt.Errorf("%w; nothing was changed: the files published before are as they were",
			fmt.Errorf("publish: %w", &fs.PathError{Op: "replace", Path: filepath.Join(out, "farm-sun.ics"), Err: syscall.EPERM})),
			`--out: "` + out + `": cannot use farm-sun.ics in it (operation not permitted; this user may not: change the file's owner or permissions, or remove it, and publish writes it again); nothing was changed: the files published before are as they were`},
	} {
		err := outDirFailed("--out", out, tc.err)
		if err.Error() != tc.want {
			t.Errorf("message\n%s\nwant\n%s", err, tc.want)
		}
		if !errors.Is(err, tc.err) {
			t.Errorf("%v does not unwrap to the publish's error", err)
		}
	}
}

// Publishing into a directory the user may not write to, or under one,
// fails (exit 1) naming the directory and the flag, with the hint, and
// leaves the directory as it was. The superuser writes into any directory:
// the test needs another user.
func TestPublishUnwritableOutDir(t *testing.T) {
	if os.Geteuid() == 0 {
		t.Skip("run as root, who may write into any directory")
	}
	ro := filepath.Join(t.TempDir(), "ro")
	if err := os.Mkdir(ro, 0o555); err != nil {
		t.Fatal(err)
	}
	t.Cleanup(func() { os.Chmod(ro, 0o755) })
	for _, tc := range []struct{ out, want string }{
		{ro, `heliocal: --out: "` + ro + `": cannot write into it (permission denied; give a directory this user may write to, or change its permissions); nothing was changed: the files published before are as they were` + "\n"},
		{filepath.Join(ro, "sub"), `heliocal: --out: "` + filepath.Join(ro, "sub") + `": cannot create it (permission denied; give a directory this user may write to, or change its permissions)` + "\n"},
	} {
		code, _, errOut := runCLI(t, "publish", "--quiet", "--out", tc.out)
		if code != exitFailure || errOut != tc.want {
			t.Errorf("exit %d, %q; want %d and %q", code, errOut, exitFailure, tc.want)
		}
		if strings.Contains(errOut, ".tmp-") {
			t.Errorf("%q names a temporary file", errOut)
		}
	}
	if left, err := os.ReadDir(ro); err != nil || len(left) != 0 {
		t.Errorf("the directory holds %v (%v), want it as it was, empty", left, err)
	}
}

// A directory that exists but in which nothing can be created, /proc/1 on
// Linux (the superuser gets "no such file or directory" for a new file
// there, another user "permission denied"), is named with the flag, not by
// the temporary file the publish tried to create.
func TestPublishProcOutDir(t *testing.T) {
	if fi, err := os.Stat("/proc/1"); err != nil || !fi.IsDir() {
		t.Skip("no /proc/1 directory on this system")
	}
	code, _, errOut := runCLI(t, "publish", "--quiet", "--out", "/proc/1")
	if want := `heliocal: --out: "/proc/1": cannot `; code != exitFailure || !strings.HasPrefix(errOut, want) || strings.Contains(errOut, ".tmp-") {
		t.Errorf("exit %d, %q; want %d and a message starting %q, without the temporary file", code, errOut, exitFailure, want)
	}
}

// A relative service.out_dir is read from the working directory, a
// relative skyline file from the configuration file's directory, as
// docs/configuration.md says: run from elsewhere, check finds the skyline
// beside the file and names the output directory joined to the working
// directory, and publish writes there and names it so.
func TestOutDirFromWorkingDirectory(t *testing.T) {
	confDir, work := t.TempDir(), t.TempDir()
	if err := os.WriteFile(filepath.Join(confDir, "hills.csv"), []byte("azimuth,altitude\n0,2\n90,8\n180,1\n270,4\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	cfg := filepath.Join(confDir, "heliocal.yaml")
	if err := os.WriteFile(cfg, []byte(`service:
  out_dir: calendars
sites:
  - {id: finca-guira, latitude: 22.85, longitude: -82.5, timezone: America/Havana, horizon: hills.csv}
feeds:
  - {id: guira-sun, site: finca-guira, days_back: 0, days_ahead: 3, kinds: [sunrise]}
`), 0o644); err != nil {
		t.Fatal(err)
	}
	t.Chdir(work)
	out := filepath.Join(work, "calendars")

	code, text, errOut := runCLI(t, "check", "--config", cfg)
	if code != 0 {
		t.Fatalf("check: exit %d: %s", code, errOut)
	}
	want := "out_dir: " + out + " (calendars, relative to the working directory)\n"
	if !strings.Contains(text, want) || !strings.Contains(text, "skyline 1–8° (4 points, hills.csv)") {
		t.Errorf("check:\n%s\nwant %q and the skyline of hills.csv", text, want)
	}
	// an absolute directory is named alone
	if _, text, _ := runCLIEnv(t, map[string]string{"HELIOCAL_OUT_DIR": out}, "check", "--config", cfg); !strings.Contains(text, "\nout_dir: "+out+"\n\n") {
		t.Errorf("check with HELIOCAL_OUT_DIR=%s:\n%s", out, text)
	}
	var r checkReport
	runJSON(t, &r, "check", "--config", cfg, "--format", "json")
	if r.OutDir != out || len(r.Sites) != 1 || r.Sites[0].SkylineFile != filepath.Join(confDir, "hills.csv") {
		t.Errorf("check --format json: out_dir %q, sites %+v; want %q and the skyline file in %s", r.OutDir, r.Sites, out, confDir)
	}

	code, _, errOut = runCLI(t, "publish", "--config", cfg)
	if code != 0 {
		t.Fatalf("publish: exit %d: %s", code, errOut)
	}
	if _, err := os.Stat(filepath.Join(out, "guira-sun.ics")); err != nil {
		t.Errorf("publish did not write into the working directory's calendars: %v", err)
	}
	if _, err := os.Stat(filepath.Join(confDir, "calendars")); !errors.Is(err, fs.ErrNotExist) {
		t.Errorf("publish made a directory beside the configuration: %v", err)
	}
	for _, want := range []string{" to " + out + "\n", " to " + out + string(os.PathSeparator) + "\n"} {
		if !strings.Contains(errOut, want) {
			t.Errorf("publish:\n%s\nwant %q", errOut, want)
		}
	}
	// --out is named as it was typed
	code, _, errOut = runCLI(t, "publish", "--config", cfg, "--out", "elsewhere")
	if code != 0 || !strings.Contains(errOut, " to elsewhere"+string(os.PathSeparator)+"\n") {
		t.Errorf("publish --out elsewhere: exit %d:\n%s", code, errOut)
	}
}

// An output directory that is a symbolic link leading nowhere (its target
// removed, as after moving the web root, or a loop), or that lies under
// one, is refused as bad input naming the flag, the link and its target,
// before anything is computed; nothing is created at the target. A link to
// a directory is followed as any directory is.
func TestPublishOutDirBrokenLink(t *testing.T) {
	dir := t.TempDir()
	gone := filepath.Join(dir, "moved-away")
	dangling := filepath.Join(dir, "feeds")
	loop1, loop2 := filepath.Join(dir, "loop1"), filepath.Join(dir, "loop2")
	for _, l := range [][2]string{{gone, dangling}, {loop2, loop1}, {loop1, loop2}} {
		if err := os.Symlink(l[0], l[1]); err != nil {
			t.Skipf("no symbolic links here: %v", err)
		}
	}
	for _, tc := range []struct{ out, want string }{
		{dangling, fmt.Sprintf(`heliocal: --out: %q: a symbolic link to %q, which does not exist (create it, or give another directory)`, dangling, gone)},
		{filepath.Join(dangling, "sky"), fmt.Sprintf(`heliocal: --out: %q: %s is a symbolic link to %q, which does not exist (create it, or give another directory)`,
			filepath.Join(dangling, "sky"), dangling, gone)},
		{loop1, fmt.Sprintf(`heliocal: --out: %q: a symbolic link to %q, which cannot be followed (too many levels of symbolic links; give another directory)`, loop1, loop2)},
	} {
		code, _, errOut := runCLI(t, "publish", "--quiet", "--out", tc.out)
		if code != exitInput || errOut != tc.want+"\n" {
			t.Errorf("exit %d, %q\nwant %d, %q", code, errOut, exitInput, tc.want)
		}
	}
	if _, err := os.Lstat(gone); !errors.Is(err, fs.ErrNotExist) {
		t.Errorf("the link's target was created: %v", err)
	}
	// a link to a directory is a directory
	real := filepath.Join(dir, "real")
	if err := os.Mkdir(real, 0o755); err != nil {
		t.Fatal(err)
	}
	link := filepath.Join(dir, "public")
	if err := os.Symlink(real, link); err != nil {
		t.Fatal(err)
	}
	if code, _, errOut := runCLI(t, "publish", "--quiet", "--out", link); code != 0 {
		t.Fatalf("publish into a link to a directory: exit %d: %s", code, errOut)
	}
	if _, err := os.Stat(filepath.Join(real, "feeds.json")); err != nil {
		t.Errorf("nothing published through the link: %v", err)
	}
}

// docs/feeds.md quotes the error of a publish into a full disk word for
// word, as outDirFailed writes it for the error the writer returns
// (TestOutDirFailedWords, "full disk").
func TestDiskFullWordsDocumented(t *testing.T) {
	err := fmt.Errorf("%w; nothing was changed: the files published before are as they were",
		&publish.DiskFullError{Dir: "public", File: "farm-sun.ics",
			Err: &fs.PathError{Op: "write", Path: filepath.Join("public", ".farm-sun.ics.tmp-1"), Err: syscall.ENOSPC}})
	msg := outDirFailed("--out", "public", err).Error()
	doc, rerr := os.ReadFile("../../docs/feeds.md")
	if rerr != nil {
		t.Fatal(rerr)
	}
	if text := strings.Join(strings.Fields(string(doc)), " "); !strings.Contains(text, "`"+msg+"`") {
		t.Errorf("docs/feeds.md does not quote the full disk's error as publish says it:\n%s", msg)
	}
}
