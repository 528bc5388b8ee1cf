package api_test

import (
	"context"
	"encoding/json"
	"errors"
	"net/http"
	"net/http/httptest"
	"strings"
	"testing"

	"github.com/pathvet/pathvet/api"
	"github.com/pathvet/pathvet/api/service"
)

// fakeStore answers from memory; its err is returned by every call that
// reads submissions.
type fakeStore struct {
	pingErr error
	err     error
}

func (f *fakeStore) Ping(context.Context) error { return f.pingErr }
func (f *fakeStore) KeyByToken(_ context.Context, token string) (*service.Key, error) {
	switch token {
	case "good":
		return &service.Key{ID: 1, OfficeID: 1, Role: service.RoleEditor}, nil
	case "other": // another office's key
		return &service.Key{ID: 2, OfficeID: 2, Role: service.RoleEditor}, nil
	}
	return nil, service.Errorf(service.ENotFound, "key not found")
}
func (f *fakeStore) CreateSubmission(context.Context, service.NewSubmission) (*service.Submission, bool, error) {
	return nil, false, f.err
}
func (f *fakeStore) Submission(context.Context, string, service.Scope) (*service.Submission, error) {
	return nil, f.err
}
func (f *fakeStore) Submissions(context.Context, service.Filter) ([]*service.Submission, string, error) {
	return nil, "", f.err
}
func (f *fakeStore) DeleteSubmission(context.Context, string, service.Scope) error { return f.err }
func (f *fakeStore) Rerun(context.Context, string, service.Scope) (*service.Submission, error) {
	return nil, f.err
}
func (f *fakeStore) LatestReport(context.Context, string, service.Scope, int64) (*service.StoredReport, error) {
	return nil, f.err
}

func (f *fakeStore) SetWebhook(context.Context, int64, string) (*service.Webhook, error) {
	return nil, f.err
}
func (f *fakeStore) Webhook(context.Context, int64) (*service.Webhook, error) { return nil, f.err }
func (f *fakeStore) DeleteWebhook(context.Context, int64) error               { return f.err }
func (f *fakeStore) Deliveries(context.Context, int64, int) ([]*service.Delivery, error) {
	return nil, f.err
}

func serve(t *testing.T, fs *fakeStore, method, path, token string) (*httptest.ResponseRecorder, api.Problem) {
	t.Helper()
	srv := api.New(api.Config{Store: fs})
	req := httptest.NewRequest(method, path, strings.NewReader(""))
	if token != "" {
		req.Header.Set("Authorization", "Bearer "+token)
	}
	rr := httptest.NewRecorder()
	srv.Echo().ServeHTTP(rr, req)
	var p api.Problem
	_ = json.Unmarshal(rr.Body.Bytes(), &p)
	return rr, p
}

// Error codes map to statuses in one place; an internal error shows the
// client only "internal error".
func TestErrors_MapToProblems(t *testing.T) {
	for _, tc := range []struct {
		err    error
		status int
		detail string
	}{
		{service.Errorf(service.ENotFound, "submission not found"), 404, "submission not found"},
		{service.Errorf(service.EConflict, "busy"), 409, "busy"},
		{service.Errorf(service.EInvalid, "bad cursor"), 400, "bad cursor"},
		{errors.New("connection reset by peer at 10.1.2.3"), 500, "internal error"},
	} {
		rr, p := serve(t, &fakeStore{err: tc.err}, http.MethodGet, "/v1/submissions/x", "good")
		if rr.Code != tc.status || p.Status != tc.status || p.Detail != tc.detail ||
			rr.Header().Get("Content-Type") != api.ProblemContentType {
			t.Errorf("%v: %d %+v", tc.err, rr.Code, p)
		}
	}
}

func TestReadyz(t *testing.T) {
	if rr, _ := serve(t, &fakeStore{}, http.MethodGet, "/readyz", ""); rr.Code != 200 {
		t.Fatalf("ready: %d", rr.Code)
	}
	if rr, p := serve(t, &fakeStore{pingErr: errors.New("down")}, http.MethodGet, "/readyz", ""); rr.Code != 503 ||
		p.Status != 503 {
		t.Fatalf("database down: %d %+v", rr.Code, p)
	}
}

func TestUnknownRouteIsAProblem(t *testing.T) {
	rr, p := serve(t, &fakeStore{}, http.MethodGet, "/nowhere", "")
	if rr.Code != 404 || p.Type == "" || p.Instance != "/nowhere" {
		t.Fatalf("%d %+v", rr.Code, p)
	}
	if rr, _ := serve(t, &fakeStore{}, http.MethodGet, "/v1/submissions", "bad"); rr.Code != 401 {
		t.Fatalf("bad token: %d", rr.Code)
	}
}
