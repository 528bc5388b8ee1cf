package api

import (
	"bytes"
	"errors"
	"fmt"
	"io"
	"mime"
	"net/http"

	"github.com/labstack/echo/v4"
)

// readPackage reads the request body: the package JSON, and the CSV data
// when they come as a multipart part, spooled to a temporary file that the
// caller closes.
func (s *Server) readPackage(c echo.Context) (doc []byte, data *spool, err error) {
	req := c.Request()
	mt, _, perr := mime.ParseMediaType(req.Header.Get(echo.HeaderContentType))
	switch {
	case perr == nil && mt == echo.MIMEMultipartForm:
		return s.readMultipart(c)
	case perr == nil && (mt == echo.MIMEApplicationJSON || mt == "application/vnd.pathvet.package+json"):
		doc, err = readLimited(req.Body, s.cfg.Limits.PackageBytes, "package", req.ContentLength)
		return doc, nil, err
	}
	return nil, nil, problemError(http.StatusUnsupportedMediaType,
		"Send the package as application/json, or as multipart/form-data with parts named package and data.")
}

func (s *Server) readMultipart(c echo.Context) (doc []byte, data *spool, err error) {
	mr, err := c.Request().MultipartReader()
	if err != nil {
		return nil, nil, problemError(http.StatusBadRequest, "The multipart body cannot be read: "+err.Error())
	}
	defer func() {
		if err != nil && data != nil {
			data.Close()
		}
	}()
	for {
		part, err := mr.NextPart()
		if errors.Is(err, io.EOF) {
			break
		}
		if err != nil {
			return nil, data, bodyError(err)
		}
		switch part.FormName() {
		case "package":
			err = onlyOnce(doc != nil, "package")
			if err == nil {
				doc, err = readLimited(part, s.cfg.Limits.PackageBytes, "package", 0)
			}
		case "data":
			err = onlyOnce(data != nil, "data")
			if err == nil {
				data, err = newSpool(part, s.cfg.Limits.CSVBytes)
			}
		default:
			err = problemError(http.StatusBadRequest,
				fmt.Sprintf("Unknown multipart part %q: the parts are package and data.", part.FormName()))
		}
		if err != nil {
			return nil, data, err
		}
	}
	if doc == nil {
		return nil, data, problemError(http.StatusBadRequest, "The multipart body has no part named package.")
	}
	return doc, data, nil
}

// onlyOnce refuses a second multipart part of one name.
func onlyOnce(earlier bool, name string) error {
	if earlier {
		return problemError(
			http.StatusBadRequest,
			fmt.Sprintf("The multipart body has more than one part named %s.", name),
		)
	}
	return nil
}

// readLimited reads at most limit bytes; more is 413 naming the limit.
// size, when positive, is the expected size (from Content-Length): the
// buffer is made that large at once, so that a large upload is not copied
// again and again as it grows.
func readLimited(r io.Reader, limit int64, what string, size int64) ([]byte, error) {
	buf := bytes.NewBuffer(make([]byte, 0, min(max(size, 0), limit)+bytes.MinRead))
	if _, err := buf.ReadFrom(io.LimitReader(r, limit+1)); err != nil {
		return nil, bodyError(err)
	}
	b := buf.Bytes()
	if int64(len(b)) > limit {
		return nil, problemError(http.StatusRequestEntityTooLarge,
			fmt.Sprintf("The %s is larger than the limit of %d bytes.", what, limit))
	}
	return b, nil
}

// bodyError turns a failed read of the body into 413 when the body limit
// cut it, errTooSlow when the upload rules did, 400 otherwise.
func bodyError(err error) error {
	if errors.Is(err, errTooSlow) {
		return errTooSlow
	}
	var he *echo.HTTPError
	if errors.As(err, &he) {
		return he
	}
	return problemError(http.StatusBadRequest, "The request body cannot be read: "+err.Error())
}
