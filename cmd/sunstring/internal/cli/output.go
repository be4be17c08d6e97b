package cli

import (
	"context"
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"sort"
	"strings"
	"time"
)

// markerFile marks a folder as sunstring's own report folder, which a later run may replace.
const markerFile = ".sunstring-report"

// outputSet is the files of one report, written together or not at all.
type outputSet map[string][]byte

// commit writes the files into a new folder beside dir and swaps it into place: a failed run
// leaves an earlier report untouched, and a reader never sees a half-written one. An existing
// dir is replaced only when it is empty or an earlier sunstring report. When ctx is done
// before the folder is swapped into place, nothing is written and ctx's error is returned.
func (o outputSet) commit(ctx context.Context, dir string) error {
	dir = filepath.Clean(dir)
	if st, err := os.Stat(dir); err == nil {
		if !st.IsDir() {
			return inputError{fmt.Errorf("%s: the output path is a file; give a folder (-o)", dir)}
		}
		if !replaceable(dir) {
			return inputError{fmt.Errorf("%s: the output folder exists and is not a sunstring report folder; choose another folder or empty it", dir)}
		}
	} else if !errors.Is(err, os.ErrNotExist) {
		return fmt.Errorf("output folder %s: %w", dir, err)
	}
	parent := filepath.Dir(dir)
	if err := os.MkdirAll(parent, 0o755); err != nil {
		return fmt.Errorf("output folder %s: %w", parent, err)
	}
	removeStale(parent)
	tmp, err := os.MkdirTemp(parent, ".sunstring-new-*")
	if err != nil {
		return fmt.Errorf("output folder %s: %w", dir, err)
	}
	ok := false
	defer func() {
		if !ok {
			os.RemoveAll(tmp)
		}
	}()
	names := make([]string, 0, len(o))
	for n := range o {
		names = append(names, n)
	}
	sort.Strings(names)
	for _, n := range append(names, markerFile) {
		b := o[n]
		if n == markerFile {
			b = []byte("This folder was written by sunstring and is replaced whole by the next run into it.\n")
		}
		p := filepath.Join(tmp, n)
		if err := os.MkdirAll(filepath.Dir(p), 0o755); err != nil {
			return fmt.Errorf("output %s: %w", n, err)
		}
		if err := writeSynced(p, b); err != nil {
			return fmt.Errorf("output %s: %w", n, err)
		}
		if err := ctx.Err(); err != nil {
			return err
		}
	}
	if err := os.Chmod(tmp, 0o755); err != nil {
		return fmt.Errorf("output folder %s: %w", dir, err)
	}
	if err := ctx.Err(); err != nil {
		return err
	}
	old := ""
	if _, err := os.Stat(dir); err == nil {
		old = tmp + ".old"
		if err := os.Rename(dir, old); err != nil {
			return fmt.Errorf("output folder %s: moving the earlier report aside: %w", dir, err)
		}
	}
	if err := os.Rename(tmp, dir); err != nil {
		if old != "" {
			os.Rename(old, dir) // put the earlier report back
		}
		return fmt.Errorf("output folder %s: %w", dir, err)
	}
	ok = true
	if old != "" {
		os.RemoveAll(old)
	}
	return nil
}

func writeSynced(p string, b []byte) error {
	f, err := os.OpenFile(p, os.O_WRONLY|os.O_CREATE|os.O_EXCL, 0o644)
	if err != nil {
		return err
	}
	if _, err := f.Write(b); err != nil {
		f.Close()
		return err
	}
	if err := f.Sync(); err != nil {
		f.Close()
		return err
	}
	return f.Close()
}

// replaceable reports whether dir is empty or holds an earlier sunstring report.
func replaceable(dir string) bool {
	es, err := os.ReadDir(dir)
	if err != nil {
		return false
	}
	if len(es) == 0 {
		return true
	}
	_, err = os.Stat(filepath.Join(dir, markerFile))
	return err == nil
}

// staleAfter is how old a leftover temporary folder must be before a later run removes it: a
// run killed while writing (power cut, SIGKILL) cannot clean up after itself, and no run takes
// anywhere near this long to write its files.
const staleAfter = 10 * time.Minute

// removeStale deletes temporary folders that an earlier, killed run left beside the output.
func removeStale(parent string) {
	es, err := os.ReadDir(parent)
	if err != nil {
		return
	}
	for _, e := range es {
		if !e.IsDir() || !strings.HasPrefix(e.Name(), ".sunstring-new-") {
			continue
		}
		if info, err := e.Info(); err == nil && time.Since(info.ModTime()) > staleAfter {
			os.RemoveAll(filepath.Join(parent, e.Name()))
		}
	}
}
