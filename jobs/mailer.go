package jobs

import (
	"bytes"
	"context"
	"crypto/tls"
	"errors"
	"fmt"
	"log/slog"
	"os"
	"path/filepath"
	"regexp"
	"strings"

	gomail "github.com/wneessen/go-mail"

	"plumbline/jobs/config"
)

// Sender delivers one built message and returns the server's reply (or a
// description of where it went).
type Sender interface {
	Send(ctx context.Context, m *gomail.Msg) (reply string, err error)
}

// NewSender returns the sender chosen by [mail] delivery: "folder" writes
// .eml files, "smtp" talks to a server. For SMTP with AUTH the password
// is read now, from the environment variable or the file the
// configuration names, and kept only in memory.
func NewSender(m config.Mail, getenv func(string) string, log *slog.Logger) (Sender, error) {
	switch m.Delivery {
	case "folder":
		if err := os.MkdirAll(m.Folder, 0o750); err != nil {
			return nil, fmt.Errorf("mail folder: %w", err)
		}
		return FolderSender{Dir: m.Folder}, nil
	case "smtp":
		pw, err := loadPassword(m, getenv)
		if err != nil {
			return nil, err
		}
		return &SMTPSender{cfg: m, password: pw}, nil
	}
	return nil, fmt.Errorf("mail delivery %q: want \"folder\" or \"smtp\"", m.Delivery)
}

// FolderSender writes each message as Dir/<Message-ID>.eml. Writing the
// same message again replaces the file, so a retry leaves one copy.
type FolderSender struct{ Dir string }

var unsafeFileChars = regexp.MustCompile(`[^A-Za-z0-9._@-]+`)

func (f FolderSender) Send(ctx context.Context, m *gomail.Msg) (string, error) {
	id := strings.Trim(m.GetMessageID(), "<>")
	if id == "" {
		return "", errors.New("folder delivery: message has no Message-ID")
	}
	var buf bytes.Buffer
	if _, err := m.WriteTo(&buf); err != nil {
		return "", fmt.Errorf("folder delivery: %w", err)
	}
	name := filepath.Join(f.Dir, unsafeFileChars.ReplaceAllString(id, "_")+".eml")
	if err := writeFileAtomic(name, buf.Bytes(), 0o640); err != nil {
		return "", fmt.Errorf("folder delivery: %w", err)
	}
	return "written to " + name, nil
}

// SMTPSender sends through an SMTP server, one connection per message.
type SMTPSender struct {
	cfg      config.Mail
	password secret
	// TLSConfig overrides the TLS settings (tests use it to trust a
	// local certificate); nil verifies the server against the system
	// roots for Host.
	TLSConfig *tls.Config
}

// String describes the sender without its password; fmt would otherwise
// print the unexported password field raw when formatting the struct.
func (s *SMTPSender) String() string {
	return fmt.Sprintf("smtp %s:%d tls=%s auth=%s user=%q", s.cfg.Host, s.cfg.Port, s.cfg.TLS, s.cfg.Auth, s.cfg.Username)
}

func (s *SMTPSender) GoString() string     { return s.String() }
func (s *SMTPSender) LogValue() slog.Value { return slog.StringValue(s.String()) }

func (s *SMTPSender) client() (*gomail.Client, error) {
	m := s.cfg
	opts := []gomail.Option{
		gomail.WithPort(m.Port),
		gomail.WithTimeout(m.Timeout.D()),
	}
	switch m.TLS {
	case "starttls":
		opts = append(opts, gomail.WithTLSPolicy(gomail.TLSMandatory))
	case "implicit":
		opts = append(opts, gomail.WithSSL())
	case "none":
		// Plain text, for a relay on the same host and for tests.
		opts = append(opts, gomail.WithTLSPolicy(gomail.NoTLS))
	default:
		return nil, fmt.Errorf("smtp: tls %q: want starttls, implicit or none", m.TLS)
	}
	if s.TLSConfig != nil {
		opts = append(opts, gomail.WithTLSConfig(s.TLSConfig))
	}
	switch m.Auth {
	case "plain":
		opts = append(opts, gomail.WithSMTPAuth(gomail.SMTPAuthPlain),
			gomail.WithUsername(m.Username), gomail.WithPassword(string(s.password)))
	case "login":
		opts = append(opts, gomail.WithSMTPAuth(gomail.SMTPAuthLogin),
			gomail.WithUsername(m.Username), gomail.WithPassword(string(s.password)))
	case "none":
	default:
		return nil, fmt.Errorf("smtp: auth %q: want plain, login or none", m.Auth)
	}
	return gomail.NewClient(m.Host, opts...)
}

// Send dials the server, sends m and returns the server's final reply,
// which usually carries its queue id.
func (s *SMTPSender) Send(ctx context.Context, m *gomail.Msg) (string, error) {
	c, err := s.client()
	if err != nil {
		return "", err
	}
	if err := c.DialAndSendWithContext(ctx, m); err != nil {
		return "", fmt.Errorf("smtp %s:%d: %w", s.cfg.Host, s.cfg.Port, err)
	}
	return m.ServerResponse(), nil
}

// secret is a password held in memory. It prints, logs and encodes as
// "[redacted]", so a stray %v or slog attribute cannot leak it.
type secret string

func (secret) String() string               { return "[redacted]" }
func (secret) GoString() string             { return "[redacted]" }
func (secret) LogValue() slog.Value         { return slog.StringValue("[redacted]") }
func (secret) MarshalText() ([]byte, error) { return []byte("[redacted]"), nil }

// loadPassword reads the SMTP password from where [mail] says. Errors
// name the variable or file, never the content.
func loadPassword(m config.Mail, getenv func(string) string) (secret, error) {
	if m.Auth == "none" {
		return "", nil
	}
	switch {
	case m.PasswordEnv != "" && m.PasswordFile != "":
		return "", errors.New("mail: set password_env or password_file, not both")
	case m.PasswordEnv != "":
		pw := getenv(m.PasswordEnv)
		if pw == "" {
			return "", fmt.Errorf("mail: environment variable %s (password_env) is empty or unset", m.PasswordEnv)
		}
		return secret(pw), nil
	case m.PasswordFile != "":
		b, err := os.ReadFile(m.PasswordFile)
		if err != nil {
			var pe *os.PathError
			if errors.As(err, &pe) {
				err = pe.Err // keep the reason, drop nothing secret
			}
			return "", fmt.Errorf("mail: password_file %s: %w", m.PasswordFile, err)
		}
		pw := strings.TrimRight(string(b), "\r\n")
		if pw == "" {
			return "", fmt.Errorf("mail: password_file %s is empty", m.PasswordFile)
		}
		return secret(pw), nil
	}
	return "", fmt.Errorf("mail: auth %q needs password_env or password_file", m.Auth)
}
