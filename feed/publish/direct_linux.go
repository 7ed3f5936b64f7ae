package publish

import (
	"errors"
	"io"
	"io/fs"
	"os"
	"strconv"
	"strings"
	"syscall"
	"unsafe"
)

// directMin is the smallest file written around the page cache: below it
// the cache costs little.
const directMin = 256 << 10

// directAlign is the alignment O_DIRECT asks of the buffer, the length and
// the file offset: 4096 suits every block size in use.
const directAlign = 4096

// writeDirect writes data to f, a new empty file, around the page cache
// where it can: the whole 4096-byte blocks of the head with O_DIRECT, the
// tail through the cache. Copying a feed into freshly allocated cache pages
// was most of the system time of a large publish (for 1.5 GB of new files,
// about 3.5 s of CPU against 0.4 s with O_DIRECT on this project's machine);
// the web server reads the file from the disk once instead. The caller
// still fsyncs, as for any file. It reports false, having written nothing,
// when it cannot (a small file, a buffer not aligned, a file system without
// O_DIRECT).
func writeDirect(f *os.File, data []byte) (bool, error) {
	n := len(data) &^ (directAlign - 1)
	if n < directMin || uintptr(unsafe.Pointer(unsafe.SliceData(data)))%directAlign != 0 {
		return false, nil
	}
	rc, err := f.SyscallConn()
	if err != nil {
		return false, nil
	}
	flags, ok := -1, false
	if err := rc.Control(func(fd uintptr) {
		fl, _, e := syscall.Syscall(syscall.SYS_FCNTL, fd, syscall.F_GETFL, 0)
		if e != 0 {
			return
		}
		flags = int(fl)
		_, _, e = syscall.Syscall(syscall.SYS_FCNTL, fd, syscall.F_SETFL, uintptr(flags|syscall.O_DIRECT))
		ok = e == 0
	}); err != nil || !ok {
		return false, nil
	}
	written, werr := writeHeld(rc, f.Name(), data[:n])
	var cerr error
	if err := rc.Control(func(fd uintptr) {
		if _, _, e := syscall.Syscall(syscall.SYS_FCNTL, fd, syscall.F_SETFL, uintptr(flags)); e != 0 {
			cerr = e
		}
	}); err != nil {
		cerr = err
	}
	switch {
	case cerr != nil:
		return true, cerr
	case werr != nil && !errors.Is(werr, syscall.EINVAL):
		return true, werr
	}
	// The rest through the cache: the tail, and all that O_DIRECT refused
	// (EINVAL: a file system without it, or a short write that left the
	// offset unaligned).
	_, err = f.Write(data[written:])
	return true, err
}

// The two calls that wait for the disk, the O_DIRECT write and the fsync of
// each feed, are made without telling the Go scheduler (RawSyscall): the
// worker keeps its processor while it waits instead of handing it over. A
// call the scheduler is told about and that blocks past its next check
// (20 µs) has its processor handed off, and every such hand-off puts the
// runtime's monitor thread back to waking every 20 µs for the next
// millisecond or more: with two waits per feed that thread never slept
// longer, about 5 % of the CPU of publishing 1,000 feeds on 2 cores (perf),
// plus the hand-offs themselves. The processor held is one a worker would
// leave idle anyway (there are as many workers as processors, and the
// calendars wait in a bounded queue), and the other workers go on; what
// waits is a stop-the-world of the garbage collector, for one write or
// fsync at most. Only Publish's writer does this, in the publish command.

// writeHeld writes data at the offset of rc's file, name, in as many
// write(2) calls as it takes, holding the processor (see above); it
// returns how much was written and the first error.
func writeHeld(rc syscall.RawConn, name string, data []byte) (int, error) {
	written := 0
	var werr error
	if err := rc.Control(func(fd uintptr) {
		for written < len(data) {
			n, _, e := syscall.RawSyscall(syscall.SYS_WRITE, fd, uintptr(unsafe.Pointer(&data[written])), uintptr(len(data)-written))
			switch {
			case e == syscall.EINTR:
				continue
			case e != 0:
				werr = &os.PathError{Op: "write", Path: name, Err: e}
				return
			case n == 0:
				werr = io.ErrShortWrite
				return
			}
			written += int(n)
		}
	}); err != nil {
		return written, err
	}
	return written, werr
}

// syncHeld is f.Sync holding the processor (see above).
func syncHeld(f *os.File) error {
	rc, err := f.SyscallConn()
	if err != nil {
		return f.Sync()
	}
	var serr error
	if err := rc.Control(func(fd uintptr) {
		for {
			_, _, e := syscall.RawSyscall(syscall.SYS_FSYNC, fd, 0, 0)
			if e == syscall.EINTR {
				continue
			}
			if e != 0 {
				serr = &os.PathError{Op: "sync", Path: f.Name(), Err: e}
			}
			return
		}
	}); err != nil {
		return err
	}
	return serr
}

// umaskKeeps reports whether the process's umask, read now from
// /proc/self/status (Linux 4.7 and later), clears none of mode's bits:
// then a file created with mode has it. False when it cannot tell.
func umaskKeeps(mode fs.FileMode) bool {
	status, err := os.ReadFile("/proc/self/status")
	if err != nil {
		return false
	}
	for line := range strings.Lines(string(status)) {
		if v, ok := strings.CutPrefix(line, "Umask:"); ok {
			mask, err := strconv.ParseUint(strings.TrimSpace(v), 8, 32)
			return err == nil && fs.FileMode(mask)&mode.Perm() == 0
		}
	}
	return false
}

// openNew creates the file name, which must not exist, for reading and
// writing with mode (less the umask). It is os.OpenFile with O_CREATE and
// O_EXCL without the four calls that offer a regular file to the network
// poller (set non-blocking, register, refused, set blocking again): one
// open(2), and the one fcntl(2) of os.NewFile. The open holds the processor
// (RawSyscall, see writeHeld) like the write and the fsync: creating the
// file's inode took ext4 up to a millisecond after a run's files were
// deleted, and each such open told to the scheduler had its processor
// handed off and put the monitor thread back to waking every 20 µs.
func openNew(name string, mode fs.FileMode) (*os.File, error) {
	path, err := syscall.BytePtrFromString(name)
	if err != nil {
		return nil, &fs.PathError{Op: "open", Path: name, Err: err}
	}
	cwd := -100 // AT_FDCWD (linux/fcntl.h): name is relative to the working directory
	for {
		fd, _, e := syscall.RawSyscall6(syscall.SYS_OPENAT, uintptr(cwd), uintptr(unsafe.Pointer(path)),
			uintptr(syscall.O_RDWR|syscall.O_CREAT|syscall.O_EXCL|syscall.O_CLOEXEC), uintptr(mode.Perm()), 0, 0)
		switch {
		case e == syscall.EINTR:
			continue
		case e != 0:
			return nil, &fs.PathError{Op: "open", Path: name, Err: e}
		}
		return os.NewFile(fd, name), nil
	}
}

// hugePage is the size of a transparent huge page on amd64 and arm64 with
// 4 kB pages; hugeBufferSize the room of a worker's feed buffer: a 400-day
// feed of the daily kinds takes about 1.1 MB.
const (
	hugePage       = 2 << 20
	hugeBufferSize = 2 * hugePage
)

// newFeedBuffer returns an empty buffer of hugeBufferSize bytes for a
// worker's feeds, outside the Go heap, aligned to a huge page and marked
// for the kernel to back it with huge pages (madvise MADV_HUGEPAGE), and
// the function that unmaps it once nothing refers to it any more. The
// O_DIRECT write of a feed pins the buffer's pages and builds the disk
// request from them: one 2 MB page instead of about 270 pages of 4 kB
// (writeDirect). Without it (mmap refused) the buffer is an ordinary
// slice, and free does nothing.
func newFeedBuffer() (buf []byte, free func()) {
	m, err := syscall.Mmap(-1, 0, hugeBufferSize+hugePage, syscall.PROT_READ|syscall.PROT_WRITE, syscall.MAP_PRIVATE|syscall.MAP_ANONYMOUS)
	if err != nil {
		return make([]byte, 0, hugeBufferSize), func() {}
	}
	off := int(-uintptr(unsafe.Pointer(&m[0])) & (hugePage - 1))
	buf = m[off : off+hugeBufferSize : off+hugeBufferSize]
	// only a hint: without huge pages the buffer still works
	_ = syscall.Madvise(buf, syscall.MADV_HUGEPAGE)
	return buf[:0], func() { _ = syscall.Munmap(m) }
}
