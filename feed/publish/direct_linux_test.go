package publish

import (
	"bytes"
	"context"
	"encoding/json"
	"os"
	"path/filepath"
	"testing"
	"unsafe"

	"golang.org/x/sys/unix"

	"heliocal/feed"
)

// A feed large enough to be written around the page cache (an aligned
// head with O_DIRECT, the tail through the cache) is on disk byte for byte,
// with the file mode of every published file; so is one whose buffer is not
// aligned (written through the cache), and one on a file system without
// O_DIRECT (tmpfs, when /dev/shm is one), where writeDirect falls back.
func TestWriteDirect(t *testing.T) {
	buf := make([]byte, 0, 1_600_000)
	for i := range 1_500_123 {
		buf = append(buf, byte('A'+i*7%26))
	}
	if uintptr(unsafe.Pointer(unsafe.SliceData(buf)))%directAlign != 0 {
		t.Skip("the runtime did not align a large buffer")
	}
	dirs := []string{t.TempDir()}
	if fi, err := os.Stat("/dev/shm"); err == nil && fi.IsDir() {
		if d, err := os.MkdirTemp("/dev/shm", "heliocal-direct-"); err == nil {
			t.Cleanup(func() { os.RemoveAll(d) })
			dirs = append(dirs, d)
		}
	}
	for _, dir := range dirs {
		for _, data := range [][]byte{buf, buf[1:], buf[:directMin+10], buf[:directMin-1]} {
			w := &Writer{Dir: dir}
			if _, err := w.WriteFile("big.ics", data); err != nil {
				t.Fatalf("%s, %d bytes: %v", dir, len(data), err)
			}
			got, err := os.ReadFile(filepath.Join(dir, "big.ics"))
			if err != nil {
				t.Fatal(err)
			}
			if !bytes.Equal(got, data) {
				t.Fatalf("%s: wrote %d bytes, read back %d differing", dir, len(data), len(got))
			}
			if fi, _ := os.Stat(filepath.Join(dir, "big.ics")); fi.Mode().Perm() != FileMode {
				t.Errorf("%s: mode %v", dir, fi.Mode())
			}
		}
	}
	// On ext4 (this project's machines) the head really went around the
	// cache: none of its pages is resident after the write.
	dir := t.TempDir()
	var st unix.Statfs_t
	if err := unix.Statfs(dir, &st); err != nil || st.Type != unix.EXT4_SUPER_MAGIC {
		t.Skipf("%s is not on ext4 (file system 0x%x): residency not checked", dir, st.Type)
	}
	f, err := os.Create(filepath.Join(dir, "x"))
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	if ok, err := writeDirect(f, buf); !ok || err != nil {
		t.Fatalf("writeDirect of an aligned 1.5 MB buffer: %v, %v", ok, err)
	}
	m, err := unix.Mmap(int(f.Fd()), 0, len(buf), unix.PROT_READ, unix.MAP_SHARED)
	if err != nil {
		t.Fatal(err)
	}
	defer unix.Munmap(m)
	pages := make([]byte, (len(buf)+os.Getpagesize()-1)/os.Getpagesize())
	if _, _, e := unix.Syscall(unix.SYS_MINCORE, uintptr(unsafe.Pointer(unsafe.SliceData(m))), uintptr(len(m)), uintptr(unsafe.Pointer(unsafe.SliceData(pages)))); e != 0 {
		t.Fatal(e)
	}
	head := len(buf) &^ (directAlign - 1) / os.Getpagesize()
	resident := 0
	for _, p := range pages[:head] {
		resident += int(p & 1)
	}
	if resident > 0 {
		t.Errorf("%d of the head's %d pages are in the page cache: it was not written with O_DIRECT", resident, head)
	}
}

// A feed larger than a worker's buffer (hugeBufferSize, mapped outside the
// Go heap) is published whole, and so are the feeds the same worker renders
// before and after it, once it has outgrown that buffer: each file holds
// its own feed's bytes, as feeds.json lists them (size and SHA-256),
// written after the worker has unmapped its buffer. One worker renders
// them in order: a small feed, one larger than the buffer, a small one,
// and one large enough to be written with O_DIRECT.
func TestPublishFeedLargerThanBuffer(t *testing.T) {
	cals := testCalendars(t, "")
	again := *cals[0]
	again.ID = "orchard-sunrise-again"
	cals = append(cals, &again)
	sizes := []int{3_000, hugeBufferSize + 123_457, 2_000, 1_500_000}
	want := map[string][]byte{}
	for i, c := range cals {
		line := []byte(c.ID + " sky calendar\r\n") // each feed's bytes its own
		want[c.ID] = bytes.Repeat(line, sizes[i]/len(line)+1)[:sizes[i]]
	}
	opts := testOptions()
	opts.Workers = 1
	opts.Encode = func(c *feed.Calendar) ([]byte, error) { return want[c.ID], nil }
	dir := t.TempDir()
	if _, err := Publish(context.Background(), Calendars(cals...), opts, &Writer{Dir: dir}); err != nil {
		t.Fatal(err)
	}
	got := snapshot(t, dir)
	var fj feedsJSON
	if err := json.Unmarshal(got[FeedsJSONName], &fj); err != nil {
		t.Fatal(err)
	}
	if len(fj.Feeds) != len(cals) {
		t.Fatalf("feeds.json lists %d feeds, want %d", len(fj.Feeds), len(cals))
	}
	for _, f := range fj.Feeds {
		w := want[f.ID]
		if !bytes.Equal(got[f.File], w) {
			t.Errorf("%s: its %d bytes on disk are not the feed's %d", f.File, len(got[f.File]), len(w))
		}
		if f.Bytes != len(w) || f.Checksum != checksum(w) {
			t.Errorf("%s: feeds.json lists %d bytes, SHA-256 %s; want %d, %s", f.File, f.Bytes, f.Checksum, len(w), checksum(w))
		}
	}
}
