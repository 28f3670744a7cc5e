package main

import (
	"bufio"
	"bytes"
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
	"sort"
	"strings"
	"sync"
	"time"
)

// writeFileAtomic writes data to path through a temporary file in the same
// folder and a rename, so a reader never sees half a file and a failed run
// never leaves one. Errors name path, never the temporary file. Temporary
// files of earlier writes of path that a killed run left behind are
// removed first.
func writeFileAtomic(path string, data []byte) error {
	dir := filepath.Dir(path)
	removeStaleTemps(dir, filepath.Base(path))
	tmp, err := os.CreateTemp(dir, "."+filepath.Base(path)+".*.tmp")
	if err != nil {
		return writeError(path, err)
	}
	name := tmp.Name()
	_, werr := tmp.Write(data)
	cerr := tmp.Close()
	if werr != nil || cerr != nil {
		os.Remove(name)
		if werr != nil {
			return writeError(path, werr)
		}
		return writeError(path, cerr)
	}
	if err := os.Chmod(name, 0o644); err != nil {
		os.Remove(name)
		return writeError(path, err)
	}
	if err := os.Rename(name, path); err != nil {
		os.Remove(name)
		return writeError(path, err)
	}
	return nil
}

// writeError says that path could not be written and why, dropping the
// name of the temporary file the cause carries.
func writeError(path string, err error) error {
	return fmt.Errorf("cannot write %s: %w", path, unwrapPathError(err))
}

// unwrapPathError drops the operation and path a file error carries, when
// the message names the path the user gave instead.
func unwrapPathError(err error) error {
	var pe *fs.PathError
	if errors.As(err, &pe) {
		return pe.Err
	}
	var le *os.LinkError
	if errors.As(err, &le) {
		return le.Err
	}
	return err
}

// staleAfter is the age from which a temporary file of ours is taken for
// the leftover of a killed run: a write keeps one for milliseconds.
const staleAfter = time.Minute

// removeStaleTemps removes the temporary files ".NAME.DIGITS.tmp" that
// writeFileAtomic made for name in dir and that are older than
// staleAfter. Nothing else is touched.
func removeStaleTemps(dir, name string) {
	matches, _ := filepath.Glob(filepath.Join(dir, "."+escapeGlob(name)+".*.tmp"))
	for _, m := range matches {
		mid := strings.TrimSuffix(strings.TrimPrefix(filepath.Base(m), "."+name+"."), ".tmp")
		if mid == "" || strings.Trim(mid, "0123456789") != "" {
			continue
		}
		if info, err := os.Lstat(m); err == nil && info.Mode().IsRegular() && time.Since(info.ModTime()) > staleAfter {
			os.Remove(m)
		}
	}
}

// escapeGlob quotes the characters filepath.Match treats as patterns.
func escapeGlob(s string) string {
	r := strings.NewReplacer(`\`, `\\`, "*", `\*`, "?", `\?`, "[", `\[`)
	return r.Replace(s)
}

// writeTo renders with fn into memory and writes the file atomically.
func writeTo(path string, fn func(*bytes.Buffer) error) error {
	var buf bytes.Buffer
	if err := fn(&buf); err != nil {
		return fmt.Errorf("%s: %w", path, err)
	}
	return writeFileAtomic(path, buf.Bytes())
}

// outFolder is the --out folder of a run. tripgrade keeps the names of
// the files it wrote there in a hidden list (manifestName); when a run
// ends, the files of the earlier run that it did not write again are
// removed, so no chart of a pair that no longer exists stays behind. Only
// files on that list, with an extension tripgrade writes, are ever
// removed: what the user keeps in the folder is left alone.
type outFolder struct {
	dir   string
	old   map[string]bool // the list of the earlier run
	mu    sync.Mutex      // guards wrote: charts are written at once
	wrote []string
}

// manifestName is the hidden list of the files tripgrade wrote in a
// folder.
const manifestName = ".tripgrade-files"

// ownExtensions are the extensions of the files tripgrade writes into an
// output folder; a name on the list with another extension is not ours.
var ownExtensions = map[string]bool{".txt": true, ".md": true, ".csv": true, ".json": true, ".png": true, ".svg": true, ".html": true}

// openOutFolder creates the folder when it is missing and reads the list
// of its earlier run.
func openOutFolder(dir string) (*outFolder, error) {
	if err := os.MkdirAll(dir, 0o755); err != nil {
		return nil, fmt.Errorf("cannot create the folder %s: %w", dir, unwrapPathError(err))
	}
	o := &outFolder{dir: dir, old: map[string]bool{}}
	if f, err := os.Open(filepath.Join(dir, manifestName)); err == nil {
		sc := bufio.NewScanner(f)
		for sc.Scan() {
			if name := sc.Text(); ownName(name) {
				o.old[name] = true
			}
		}
		f.Close()
	}
	return o, nil
}

// ownName reports whether a listed name can be a file of ours in the
// folder: a plain file name (no folder, not hidden) with one of our
// extensions.
func ownName(name string) bool {
	return name != "" && !strings.HasPrefix(name, ".") && !strings.HasPrefix(name, "#") &&
		filepath.Base(name) == name && !strings.ContainsAny(name, `/\`) && ownExtensions[strings.ToLower(filepath.Ext(name))]
}

// plan records, before any file is written, the names this run will
// write, together with the earlier run's, so that a run killed half-way
// still leaves a list that covers every file of ours in the folder.
func (o *outFolder) plan(names []string) error {
	all := map[string]bool{}
	for n := range o.old {
		all[n] = true
	}
	for _, n := range names {
		all[n] = true
		removeStaleTemps(o.dir, n)
	}
	return o.writeList(all)
}

// write writes one file of the run and returns its path. It may be
// called from several goroutines at once.
func (o *outFolder) write(name string, fn func(*bytes.Buffer) error) (string, error) {
	path := filepath.Join(o.dir, name)
	if err := writeTo(path, fn); err != nil {
		return "", err
	}
	o.mu.Lock()
	o.wrote = append(o.wrote, name)
	o.mu.Unlock()
	return path, nil
}

// fileIn reports whether path names a file directly in folder dir that
// can be one of ours (ownName), and gives its name there: a file the user
// asks for by path (the audit report) that lands in the output folder is
// then one of the run's files.
func fileIn(dir, path string) (string, bool) {
	d, err1 := filepath.Abs(dir)
	at, err2 := filepath.Abs(filepath.Dir(path))
	name := filepath.Base(path)
	return name, err1 == nil && err2 == nil && d == at && ownName(name)
}

// finish removes the earlier run's files that this run did not write,
// leaves the list of this run's files and returns the paths removed.
func (o *outFolder) finish() ([]string, error) {
	now := map[string]bool{}
	for _, n := range o.wrote {
		now[n] = true
	}
	var gone []string
	for n := range o.old {
		if now[n] {
			continue
		}
		p := filepath.Join(o.dir, n)
		if info, err := os.Lstat(p); err == nil && info.Mode().IsRegular() {
			if err := os.Remove(p); err != nil {
				return gone, fmt.Errorf("cannot remove %s, written by an earlier run: %w", p, err)
			}
			gone = append(gone, p)
		}
	}
	sort.Strings(gone)
	return gone, o.writeList(now)
}

func (o *outFolder) writeList(names map[string]bool) error {
	list := make([]string, 0, len(names))
	for n := range names {
		list = append(list, n)
	}
	sort.Strings(list)
	var b bytes.Buffer
	b.WriteString("# The files tripgrade wrote in this folder. A later run into the folder\n# removes those it does not write again; no other file is touched.\n")
	for _, n := range list {
		b.WriteString(n + "\n")
	}
	return writeFileAtomic(filepath.Join(o.dir, manifestName), b.Bytes())
}

// streamFile is a file of the output folder written piece by piece (the
// findings of check --scenarios all, which are never held at once): into
// a temporary file beside it, renamed to its name by commit, so a reader
// never sees half of it.
type streamFile struct {
	o    *outFolder
	name string
	tmp  *os.File
	err  error
}

// create starts writing the file name of the run.
func (o *outFolder) create(name string) (*streamFile, error) {
	path := filepath.Join(o.dir, name)
	removeStaleTemps(o.dir, name)
	tmp, err := os.CreateTemp(o.dir, "."+name+".*.tmp")
	if err != nil {
		return nil, writeError(path, err)
	}
	return &streamFile{o: o, name: name, tmp: tmp}, nil
}

func (s *streamFile) Write(p []byte) (int, error) {
	if s.err != nil {
		return 0, s.err
	}
	n, err := s.tmp.Write(p)
	if err != nil {
		s.err = writeError(filepath.Join(s.o.dir, s.name), err)
	}
	return n, s.err
}

// commit finishes the file and gives it its name; it returns the path.
func (s *streamFile) commit() (string, error) {
	path := filepath.Join(s.o.dir, s.name)
	cerr := s.tmp.Close()
	if s.err == nil && cerr != nil {
		s.err = writeError(path, cerr)
	}
	if s.err == nil {
		if err := os.Chmod(s.tmp.Name(), 0o644); err != nil {
			s.err = writeError(path, err)
		}
	}
	if s.err == nil {
		if err := os.Rename(s.tmp.Name(), path); err != nil {
			s.err = writeError(path, err)
		}
	}
	if s.err != nil {
		os.Remove(s.tmp.Name())
		return "", s.err
	}
	s.o.mu.Lock()
	s.o.wrote = append(s.o.wrote, s.name)
	s.o.mu.Unlock()
	return path, nil
}

// abort drops the file.
func (s *streamFile) abort() {
	s.tmp.Close()
	os.Remove(s.tmp.Name())
}
