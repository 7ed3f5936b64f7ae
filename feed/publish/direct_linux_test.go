package publish

import (
	"bytes"
	"os"
	"path/filepath"
	"testing"
	"unsafe"

	"golang.org/x/sys/unix"
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
