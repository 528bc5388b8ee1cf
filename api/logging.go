package api

import (
	"context"
	"log/slog"

	"github.com/labstack/echo/v4"
	"github.com/labstack/echo/v4/middleware"
)

// loggedURI is the request's URI as the log keeps it: a published
// comment's address without its secret part, which only those the office
// gave it to should hold.
func loggedURI(v middleware.RequestLoggerValues) string {
	if v.RoutePath == commentPath+":token" {
		return commentPath + "(address withheld)"
	}
	return v.URI
}

// logRequests writes one structured log line per request, with its id.
func (s *Server) logRequests() echo.MiddlewareFunc {
	return middleware.RequestLoggerWithConfig(middleware.RequestLoggerConfig{
		LogStatus: true, LogURI: true, LogMethod: true, LogLatency: true, LogRequestID: true, LogError: true, LogRoutePath: true,
		HandleError: true,
		LogValuesFunc: func(c echo.Context, v middleware.RequestLoggerValues) error {
			level := slog.LevelInfo
			if v.Status >= 500 {
				level = slog.LevelError
			}
			attrs := []slog.Attr{
				slog.String("method", v.Method),
				slog.String("uri", loggedURI(v)),
				slog.String("route", v.RoutePath),
				slog.Int(
					"status",
					v.Status,
				),
				slog.Duration("latency", v.Latency),
				slog.String("request_id", v.RequestID),
			}
			if v.Error != nil && v.Status >= 500 {
				attrs = append(attrs, slog.String("error", v.Error.Error()))
			}
			s.cfg.Logger.LogAttrs(context.Background(), level, "request", attrs...)
			return nil
		},
	})
}
