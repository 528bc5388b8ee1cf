// Package api is pathvet's REST interface on Echo: submissions in, reports
// out, API keys per editorial office, RFC 9457 problem details for every
// error, Prometheus metrics and an OpenAPI 3.1 document.
package api

import (
	"context"
	"log/slog"
	"net/netip"
	"sync"
	"time"

	"github.com/labstack/echo/v4"

	"github.com/pathvet/pathvet/api/service"
	"github.com/pathvet/pathvet/checks/load"
)

// Store is what the API needs from storage; tests may give a fake.
type Store interface {
	Ping(ctx context.Context) error
	KeyByToken(ctx context.Context, token string) (*service.Key, error)
	CreateSubmission(ctx context.Context, n service.NewSubmission) (*service.Submission, bool, error)
	Submission(ctx context.Context, id string, sc service.Scope) (*service.Submission, error)
	Submissions(ctx context.Context, f service.Filter) ([]*service.Submission, string, error)
	DeleteSubmission(ctx context.Context, id string, sc service.Scope) error
	Rerun(ctx context.Context, id string, sc service.Scope) (*service.Submission, error)
	LatestReport(ctx context.Context, id string, sc service.Scope, have int64) (*service.StoredReport, error)
	SetWebhook(ctx context.Context, officeID int64, url string) (*service.Webhook, error)
	Webhook(ctx context.Context, officeID int64) (*service.Webhook, error)
	DeleteWebhook(ctx context.Context, officeID int64) error
	Deliveries(ctx context.Context, officeID int64, limit int) ([]*service.Delivery, error)
}

// Config configures the API.
type Config struct {
	Store  Store
	Limits load.Limits
	Logger *slog.Logger
	// RequestTimeout bounds each request; long polls stop before it.
	RequestTimeout time.Duration
	// MaxWait caps ?wait= on GET /v1/submissions/{id}.
	MaxWait time.Duration
	// PollInterval is how often a long poll looks at the submission.
	PollInterval time.Duration
	Metrics      *Metrics
	// Web is the web workspace's storage; without it the workspace's
	// routes are not served. TLSProxy: the server sits behind a
	// TLS-terminating proxy (Secure cookies). SessionTTL is how long a
	// sign-in lasts.
	Web WebStore
	// Review is the review's storage (decisions on findings, published
	// comments); without it the review's routes are not served.
	Review     ReviewStore
	TLSProxy   bool
	SessionTTL time.Duration
	// TrustedProxies are the proxies whose X-Forwarded-For entries are
	// believed (clientAddress); from any other peer the header is ignored.
	TrustedProxies []netip.Prefix
	// LargeIngests is how many spooled uploads of LargeIngestBytes or more
	// may be checked and stored at once (default 1); each can hold several
	// times its size in memory meanwhile. SlotWait is how long a spooled
	// one waits for a slot before it is 503.
	LargeIngests int
	SlotWait     time.Duration
	// UploadMinRate (bytes a second), UploadGrace and UploadIdle are the
	// upload rules: after the grace an upload must have arrived at the
	// rate on average, and no read of it may wait longer than UploadIdle;
	// else it is 408.
	UploadMinRate int64
	UploadGrace   time.Duration
	UploadIdle    time.Duration
	// Egress checks webhook URLs as they are set (the allow-list of
	// networks and hosts otherwise refused); nil refuses every address of a
	// refused class.
	Egress *service.Egress
	// JobMemory is the memory one screening job may use on a worker; raw
	// data whose estimated working memory is larger is refused (422) at
	// ingest. 0 checks nothing.
	JobMemory int64
}

// Server holds the handlers.
type Server struct {
	cfg  Config
	echo *echo.Echo
	// draining is closed by Drain: long polls answer at once.
	draining  chan struct{}
	drainOnce sync.Once
	large     chan struct{} // the large-upload semaphore
	sending   keysSending   // large uploads in progress, by key
}

// Drain makes every open and later long poll answer at once with the
// submission's current status, before the HTTP server shuts down.
func (s *Server) Drain() { s.drainOnce.Do(func() { close(s.draining) }) }

// New returns the API's HTTP handler with every route registered.
func New(cfg Config) *Server {
	if cfg.Limits == (load.Limits{}) {
		cfg.Limits = load.DefaultLimits
	}
	if cfg.Logger == nil {
		cfg.Logger = slog.Default()
	}
	if cfg.RequestTimeout == 0 {
		cfg.RequestTimeout = 60 * time.Second
	}
	if cfg.MaxWait == 0 {
		cfg.MaxWait = 30 * time.Second
	}
	if cfg.PollInterval == 0 {
		cfg.PollInterval = 200 * time.Millisecond
	}
	if cfg.SessionTTL == 0 {
		cfg.SessionTTL = 12 * time.Hour
	}
	if cfg.LargeIngests <= 0 {
		cfg.LargeIngests = 1
	}
	uploadDefaults(&cfg)
	if cfg.Egress == nil {
		cfg.Egress = &service.Egress{}
	}
	if cfg.Metrics == nil {
		cfg.Metrics = NewMetrics()
	}
	s := &Server{cfg: cfg, echo: echo.New(), draining: make(chan struct{}),
		large: make(chan struct{}, cfg.LargeIngests)}
	s.echo.HideBanner, s.echo.HidePort = true, true
	s.echo.HTTPErrorHandler = s.handleError
	s.routes()
	return s
}

// Echo returns the router, an http.Handler.
func (s *Server) Echo() *echo.Echo { return s.echo }

// bodyLimit is the largest request body: a package and its CSV data.
func (s *Server) bodyLimit() int64 { return s.cfg.Limits.PackageBytes + s.cfg.Limits.CSVBytes + 1<<20 }

// uploadDefaults fills in the upload rules left unset.
func uploadDefaults(cfg *Config) {
	for _, d := range []struct {
		v   *time.Duration
		def time.Duration
	}{{&cfg.SlotWait, DefaultSlotWait}, {&cfg.UploadGrace, DefaultUploadGrace}, {&cfg.UploadIdle, DefaultUploadIdle}} {
		if *d.v <= 0 {
			*d.v = d.def
		}
	}
	if cfg.UploadMinRate <= 0 {
		cfg.UploadMinRate = DefaultUploadMinRate
	}
}
