package api

import (
	"encoding/json"
	"io"
	"net/http"
	"strconv"
	"time"

	"github.com/labstack/echo/v4"

	"github.com/pathvet/pathvet/api/service"
)

// WebhookView is an office's webhook; Secret only in the answer to PUT.
type WebhookView struct {
	URL       string    `json:"url"`
	Secret    string    `json:"secret,omitempty"`
	CreatedAt time.Time `json:"created_at"`
}

// DeliveryView is one webhook delivery and its outcome.
type DeliveryView struct {
	ID             int64      `json:"id"`
	SubmissionID   string     `json:"submission_id"`
	Status         string     `json:"status"`
	Attempts       int        `json:"attempts"`
	LastStatusCode *int       `json:"last_status_code"`
	LastError      string     `json:"last_error,omitempty"`
	CreatedAt      time.Time  `json:"created_at"`
	FinishedAt     *time.Time `json:"finished_at"`
}

// DeliveryList is the newest deliveries, newest first.
type DeliveryList struct {
	Deliveries []DeliveryView `json:"deliveries"`
}

// editorOnly refuses a submitter key: webhooks are the office's.
func editorOnly(next echo.HandlerFunc) echo.HandlerFunc {
	return func(c echo.Context) error {
		if keyOf(c).Role != service.RoleEditor {
			return problemError(http.StatusForbidden, "Only an editor key may manage the office's webhook.")
		}
		return next(c)
	}
}

// putWebhook sets the office's webhook from {"url": "..."} and answers
// with its new signing secret, shown this once. A URL whose host resolves
// to an address deliveries may not reach (loopback, private, link-local,
// metadata, ...; see service.Egress) is refused with 400.
func (s *Server) putWebhook(c echo.Context) error {
	var in struct {
		URL string `json:"url"`
	}
	body, err := io.ReadAll(io.LimitReader(c.Request().Body, 8<<10))
	if err != nil {
		return bodyError(err)
	}
	if err := json.Unmarshal(body, &in); err != nil || in.URL == "" || !validText(in.URL) {
		return problemError(http.StatusBadRequest, `Send {"url": "https://..."} as JSON.`)
	}
	if err := s.cfg.Egress.CheckURL(c.Request().Context(), in.URL); err != nil {
		return err
	}
	w, err := s.cfg.Store.SetWebhook(c.Request().Context(), keyOf(c).OfficeID, in.URL)
	if err != nil {
		return err
	}
	return c.JSON(http.StatusOK, WebhookView{URL: w.URL, Secret: w.Secret, CreatedAt: w.CreatedAt})
}

func (s *Server) getWebhook(c echo.Context) error {
	w, err := s.cfg.Store.Webhook(c.Request().Context(), keyOf(c).OfficeID)
	if err != nil {
		return err
	}
	return c.JSON(http.StatusOK, WebhookView{URL: w.URL, CreatedAt: w.CreatedAt})
}

func (s *Server) deleteWebhook(c echo.Context) error {
	if err := s.cfg.Store.DeleteWebhook(c.Request().Context(), keyOf(c).OfficeID); err != nil {
		return err
	}
	return c.NoContent(http.StatusNoContent)
}

func (s *Server) listDeliveries(c echo.Context) error {
	limit := 50
	if l := c.QueryParam("limit"); l != "" {
		n, err := strconv.Atoi(l)
		if err != nil || n < 1 || n > service.MaxPage {
			return problemError(http.StatusBadRequest, "limit must be a whole number from 1 to 200.")
		}
		limit = n
	}
	ds, err := s.cfg.Store.Deliveries(c.Request().Context(), keyOf(c).OfficeID, limit)
	if err != nil {
		return err
	}
	out := DeliveryList{Deliveries: make([]DeliveryView, len(ds))}
	for i, d := range ds {
		out.Deliveries[i] = DeliveryView{ID: d.ID, SubmissionID: d.SubmissionID, Status: d.Status, Attempts: d.Attempts,
			LastStatusCode: d.LastStatusCode, LastError: d.LastError, CreatedAt: d.CreatedAt, FinishedAt: d.FinishedAt}
	}
	return c.JSON(http.StatusOK, out)
}
