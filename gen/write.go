package gen

import (
	"bytes"
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
	"strings"
)

// renameFile and fillTemporary are os.Rename and writeAndClose, as
// variables so that tests can make them fail (a full disk, a rename
// refused) without root-only tricks.
var (
	renameFile    = os.Rename
	fillTemporary = writeAndClose
)

// WriteChanged writes the outputs whose file is missing or differs and
// returns their paths; a file that already holds the output's bytes is
// left untouched, modification time included. It first checks every
// target (see CheckTargets) and writes nothing when one is refused.
//
// The outputs are written as one unit, so that a minimizer and its test
// file, or two minimizers that call each other's names, never go out of
// step: every new file is first written in full to a temporary file
// beside its target, and only then are they renamed into place. When a
// temporary cannot be written, every one is removed and no target has
// changed; when a rename fails, the targets already replaced get their
// former bytes back (or are removed when they were new). The error names
// the output that failed, never a temporary file, and says whether
// everything is as it was.
func WriteChanged(outs []Output) (written []string, err error) {
	if err := CheckTargets(outs); err != nil {
		return nil, err
	}
	type pending struct {
		out    Output
		tmp    string
		former []byte // the file's bytes before, nil when it did not exist (CheckTargets refused an unreadable one)
	}
	var todo []*pending
	for _, o := range outs {
		data, err := os.ReadFile(o.Path)
		if err == nil && bytes.Equal(data, o.Data) {
			continue
		}
		todo = append(todo, &pending{out: o, former: data})
	}
	removeTemporaries := func() {
		for _, w := range todo {
			if w.tmp != "" {
				os.Remove(w.tmp)
			}
		}
	}
	for _, w := range todo {
		tmp, err := writeTemporary(w.out.Path, w.out.Data)
		if err != nil {
			removeTemporaries()
			return nil, fmt.Errorf("cannot write %s: %v; nothing was changed", displayPath(w.out.Path), err)
		}
		w.tmp = tmp
	}
	for i, w := range todo {
		if err := renameFile(w.tmp, w.out.Path); err != nil {
			removeTemporaries()
			var unrestored []string
			for _, done := range todo[:i] {
				if err := restore(done.out.Path, done.former); err != nil {
					unrestored = append(unrestored, fmt.Sprintf("%s (%v)", displayPath(done.out.Path), err))
				}
			}
			if len(unrestored) > 0 {
				return nil, fmt.Errorf("cannot write %s: %v; could not put back the former contents of %s", displayPath(w.out.Path), plainError(err), strings.Join(unrestored, ", "))
			}
			return nil, fmt.Errorf("cannot write %s: %v; nothing was changed", displayPath(w.out.Path), plainError(err))
		}
		w.tmp = ""
		written = append(written, displayPath(w.out.Path))
	}
	return written, nil
}

// writeTemporary writes data in full to a new temporary file beside path
// and returns its name; on failure nothing is left behind.
func writeTemporary(path string, data []byte) (string, error) {
	tmp, err := os.CreateTemp(filepath.Dir(path), ".thalweg-*.tmp")
	if err != nil {
		return "", plainError(err)
	}
	name := tmp.Name()
	err = fillTemporary(tmp, data)
	if err != nil {
		os.Remove(name)
		return "", plainError(err)
	}
	return name, nil
}

// writeAndClose writes, syncs and closes f, mode 0644.
func writeAndClose(f *os.File, data []byte) error {
	_, err := f.Write(data)
	if err == nil {
		err = f.Chmod(0o644)
	}
	if err == nil {
		err = f.Sync()
	}
	if cerr := f.Close(); err == nil {
		err = cerr
	}
	return err
}

// restore puts a replaced file's former bytes back, or removes a file
// that did not exist before (former nil).
func restore(path string, former []byte) error {
	if former == nil {
		return plainError(os.Remove(path))
	}
	tmp, err := writeTemporary(path, former)
	if err != nil {
		return err
	}
	if err := renameFile(tmp, path); err != nil {
		os.Remove(tmp)
		return plainError(err)
	}
	return nil
}

// plainError drops the file names an os error carries (a temporary's,
// which means nothing to the user) and keeps what went wrong.
func plainError(err error) error {
	var pathErr *fs.PathError
	var linkErr *os.LinkError
	switch {
	case err == nil:
		return nil
	case errors.As(err, &pathErr):
		return pathErr.Err
	case errors.As(err, &linkErr):
		return linkErr.Err
	}
	return err
}
