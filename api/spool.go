package api

import (
	"fmt"
	"io"
	"net/http"
	"os"
)

// spool is an uploaded data part kept in a temporary file: it is copied
// there through a small buffer as it arrives, read whole once for the
// loader, and streamed from the file into the store, so that the API never
// holds the upload while it stores it.
type spool struct {
	f    *os.File
	size int64
}

// newSpool copies at most limit bytes of r into a temporary file; more is
// 413 naming the limit.
func newSpool(r io.Reader, limit int64) (*spool, error) {
	f, err := os.CreateTemp("", "pathvet-upload-*.csv")
	if err != nil {
		return nil, fmt.Errorf("api: spool the upload: %w", err)
	}
	sp := &spool{f: f}
	sp.size, err = io.Copy(f, io.LimitReader(r, limit+1))
	switch {
	case err != nil:
		sp.Close()
		return nil, bodyError(err)
	case sp.size > limit:
		sp.Close()
		return nil, problemError(http.StatusRequestEntityTooLarge,
			fmt.Sprintf("The data is larger than the limit of %d bytes.", limit))
	}
	return sp, nil
}

// bytes reads the whole upload, for the loader, which parses it in one pass.
func (sp *spool) bytes() ([]byte, error) {
	b := make([]byte, sp.size)
	if _, err := sp.f.ReadAt(b, 0); err != nil && err != io.EOF {
		return nil, fmt.Errorf("api: read the spooled upload: %w", err)
	}
	return b, nil
}

// reader reads the upload from its start.
func (sp *spool) reader() io.Reader { return io.NewSectionReader(sp.f, 0, sp.size) }

// Close removes the temporary file.
func (sp *spool) Close() {
	_ = sp.f.Close()
	_ = os.Remove(sp.f.Name())
}
