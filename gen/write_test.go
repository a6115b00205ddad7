package gen

import (
	"errors"
	"os"
	"path/filepath"
	"sort"
	"strings"
	"syscall"
	"testing"
)

// writeFixture is a directory holding one generated file, one to be
// replaced by a run of three outputs: the existing file changed, and two
// new ones.
func writeFixture(t *testing.T) (dir string, outs []Output, before map[string]string) {
	t.Helper()
	dir = t.TempDir()
	header := headerLine("s.toml") + "\n\npackage p\n"
	writeTestFile(t, filepath.Join(dir, "a_min.go"), header+"\n// old a\n")
	outs = []Output{
		{filepath.Join(dir, "a_min.go"), []byte(header + "\n// new a\n")},
		{filepath.Join(dir, "a_min_test.go"), []byte(header + "\n// new a test\n")},
		{filepath.Join(dir, "b_min.go"), []byte(header + "\n// new b\n")},
	}
	return dir, outs, listing(t, dir)
}

// listing maps every file in dir, hidden ones included, to its bytes.
func listing(t *testing.T, dir string) map[string]string {
	t.Helper()
	entries, err := os.ReadDir(dir)
	if err != nil {
		t.Fatal(err)
	}
	files := map[string]string{}
	for _, e := range entries {
		data, err := os.ReadFile(filepath.Join(dir, e.Name()))
		if err != nil {
			t.Fatal(err)
		}
		files[e.Name()] = string(data)
	}
	return files
}

func sameListing(t *testing.T, want, got map[string]string) {
	t.Helper()
	var names []string
	for name := range got {
		names = append(names, name)
	}
	sort.Strings(names)
	if len(want) != len(got) {
		t.Errorf("files now %v, want only %d as before", names, len(want))
	}
	for name, data := range want {
		if got[name] != data {
			t.Errorf("%s changed: %q, was %q", name, got[name], data)
		}
	}
}

// A full disk while the temporaries are written: no target changes, no
// temporary is left, and the message names the output, not a temporary.
func TestWriteChangedFullDisk(t *testing.T) {
	dir, outs, before := writeFixture(t)
	calls := 0
	fillTemporary = func(f *os.File, data []byte) error {
		calls++
		if calls == 2 {
			f.Close()
			return &os.PathError{Op: "write", Path: f.Name(), Err: syscall.ENOSPC}
		}
		return writeAndClose(f, data)
	}
	defer func() { fillTemporary = writeAndClose }()
	written, err := WriteChanged(outs)
	if err == nil || len(written) != 0 {
		t.Fatalf("written %v, error %v", written, err)
	}
	want := "cannot write " + displayPath(outs[1].Path) + ": no space left on device; nothing was changed"
	if err.Error() != want || strings.Contains(err.Error(), ".tmp") {
		t.Errorf("error %q, want %q", err, want)
	}
	sameListing(t, before, listing(t, dir))
}

// A rename refused after the first target was replaced: the first gets
// its former bytes back, the new files are gone, no temporary is left.
func TestWriteChangedRenameRefused(t *testing.T) {
	for _, failAt := range []int{1, 2, 3} {
		dir, outs, before := writeFixture(t)
		calls := 0
		renameFile = func(from, to string) error {
			calls++
			if calls == failAt {
				return &os.LinkError{Op: "rename", Old: from, New: to, Err: syscall.EACCES}
			}
			return os.Rename(from, to)
		}
		written, err := WriteChanged(outs)
		renameFile = os.Rename
		if err == nil || len(written) != 0 {
			t.Fatalf("rename %d refused: written %v, error %v", failAt, written, err)
		}
		want := "cannot write " + displayPath(outs[failAt-1].Path) + ": permission denied; nothing was changed"
		if err.Error() != want {
			t.Errorf("rename %d refused: error %q, want %q", failAt, err, want)
		}
		sameListing(t, before, listing(t, dir))
	}
}

// When putting a replaced file back fails too, the message says which.
func TestWriteChangedRestoreFails(t *testing.T) {
	_, outs, _ := writeFixture(t)
	calls := 0
	renameFile = func(from, to string) error {
		calls++
		if calls >= 2 {
			return &os.LinkError{Op: "rename", Old: from, New: to, Err: syscall.EIO}
		}
		return os.Rename(from, to)
	}
	defer func() { renameFile = os.Rename }()
	_, err := WriteChanged(outs)
	if err == nil || !strings.Contains(err.Error(), "could not put back the former contents of "+displayPath(outs[0].Path)) {
		t.Errorf("error %v", err)
	}
}

// An output path that is a directory is refused before anything is
// written.
func TestWriteChangedOntoDirectory(t *testing.T) {
	dir, outs, _ := writeFixture(t)
	if err := os.Mkdir(outs[2].Path, 0o755); err != nil {
		t.Fatal(err)
	}
	before := listing2(t, dir)
	_, err := WriteChanged(outs)
	if err == nil || err.Error() != displayPath(outs[2].Path)+":1:1: refusing to write: the output path is a directory" {
		t.Fatalf("error %v", err)
	}
	if after := listing2(t, dir); after != before {
		t.Errorf("files changed:\n%s\nwas\n%s", after, before)
	}
}

// listing2 lists names and sizes, directories included.
func listing2(t *testing.T, dir string) string {
	t.Helper()
	var b strings.Builder
	err := filepath.WalkDir(dir, func(path string, d os.DirEntry, err error) error {
		if err != nil {
			return err
		}
		info, err := d.Info()
		if err != nil {
			return err
		}
		data := ""
		if !d.IsDir() {
			raw, err := os.ReadFile(path)
			if err != nil {
				return err
			}
			data = string(raw)
		}
		b.WriteString(path + " " + info.Mode().String() + " " + data + "\n")
		return nil
	})
	if err != nil && !errors.Is(err, os.ErrNotExist) {
		t.Fatal(err)
	}
	return b.String()
}

// Runs at once on the same outputs all succeed and leave the right bytes
// and no temporary behind.
func TestWriteChangedConcurrent(t *testing.T) {
	dir, outs, _ := writeFixture(t)
	errs := make(chan error, 8)
	for range 8 {
		go func() {
			_, err := WriteChanged(outs)
			errs <- err
		}()
	}
	for range 8 {
		if err := <-errs; err != nil {
			t.Error(err)
		}
	}
	got := listing(t, dir)
	if len(got) != len(outs) {
		t.Errorf("files %v, want exactly the %d outputs", got, len(outs))
	}
	for _, o := range outs {
		if got[filepath.Base(o.Path)] != string(o.Data) {
			t.Errorf("%s holds %q", o.Path, got[filepath.Base(o.Path)])
		}
	}
}

// An output path that is a symbolic link, even to a file thalweg
// generated from the same spec, is refused: writing through it could
// land outside the package.
func TestWriteChangedThroughSymlink(t *testing.T) {
	dir, outs, _ := writeFixture(t)
	outside := filepath.Join(t.TempDir(), "elsewhere_min.go")
	writeTestFile(t, outside, headerLine("s.toml")+"\n\npackage p\n")
	if err := os.Symlink(outside, outs[2].Path); err != nil {
		t.Fatal(err)
	}
	before, beforeOutside := listing2(t, dir), listing2(t, filepath.Dir(outside))
	_, err := WriteChanged(outs)
	if err == nil || err.Error() != displayPath(outs[2].Path)+":1:1: refusing to write through a symbolic link: the output would land wherever it points, possibly outside the package" {
		t.Fatalf("error %v", err)
	}
	if listing2(t, dir) != before || listing2(t, filepath.Dir(outside)) != beforeOutside {
		t.Errorf("files changed")
	}
}
