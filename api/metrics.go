package api

import (
	"net/http"
	"strconv"
	"time"

	"github.com/labstack/echo/v4"
	"github.com/prometheus/client_golang/prometheus"
	"github.com/prometheus/client_golang/prometheus/collectors"
	"github.com/prometheus/client_golang/prometheus/promhttp"
)

// Metrics are the Prometheus metrics of one process.
type Metrics struct {
	registry *prometheus.Registry
	requests *prometheus.CounterVec
	latency  *prometheus.HistogramVec
	jobs     *prometheus.CounterVec
	jobTime  prometheus.Histogram
}

// NewMetrics registers the metrics in a registry of their own.
func NewMetrics() *Metrics {
	m := &Metrics{
		registry: prometheus.NewRegistry(),
		requests: prometheus.NewCounterVec(prometheus.CounterOpts{Name: "pathvet_http_requests_total",
			Help: "HTTP requests by route, method and status."}, []string{"route", "method", "status"}),
		latency: prometheus.NewHistogramVec(prometheus.HistogramOpts{Name: "pathvet_http_request_seconds",
			Help: "HTTP request latency by route.", Buckets: prometheus.DefBuckets}, []string{"route"}),
		jobs: prometheus.NewCounterVec(prometheus.CounterOpts{Name: "pathvet_jobs_total",
			Help: "Screening jobs ended, by outcome."}, []string{"status"}),
		jobTime: prometheus.NewHistogram(prometheus.HistogramOpts{Name: "pathvet_job_seconds",
			Help: "Time to screen one submission.", Buckets: prometheus.ExponentialBuckets(0.005, 2, 14)}),
	}
	m.registry.MustRegister(m.requests, m.latency, m.jobs, m.jobTime,
		collectors.NewGoCollector(), collectors.NewProcessCollector(collectors.ProcessCollectorOpts{}))
	return m
}

// Handler serves the metrics.
func (m *Metrics) Handler() http.Handler {
	return promhttp.HandlerFor(m.registry, promhttp.HandlerOpts{})
}

// JobDone records a screening job's outcome; the workers call it.
func (m *Metrics) JobDone(status string, took time.Duration) {
	m.jobs.WithLabelValues(status).Inc()
	m.jobTime.Observe(took.Seconds())
}

func (m *Metrics) middleware() echo.MiddlewareFunc {
	return func(next echo.HandlerFunc) echo.HandlerFunc {
		return func(c echo.Context) error {
			start := time.Now()
			err := next(c)
			status := c.Response().Status
			if err != nil {
				if p, _ := problemFor(err); p.Status != 0 {
					status = p.Status
				}
			}
			route := c.Path()
			if route == "" {
				route = "unmatched"
			}
			m.requests.WithLabelValues(route, c.Request().Method, strconv.Itoa(status)).Inc()
			m.latency.WithLabelValues(route).Observe(time.Since(start).Seconds())
			return err
		}
	}
}
