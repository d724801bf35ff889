package main

import (
	"context"
	"fmt"
	"log/slog"
	"os"
	"time"

	"github.com/spf13/cobra"

	"meltbook"
	"meltbook/store"
	"meltbook/web"
)

func init() { addCommand(newServeCommand) }

// tokenEnv names the environment variable that gives the web pages'
// access token when --token is not given.
const tokenEnv = "MELTBOOK_TOKEN"

// shutdownGrace is how long requests in flight may finish after Ctrl-C.
const shutdownGrace = 5 * time.Second

// serveFlags are the options of serve, shared with demo.
type serveFlags struct {
	listen string
	token  string
}

func (fl *serveFlags) register(cmd *cobra.Command) {
	cmd.Flags().StringVar(&fl.listen, "listen", "", "address to serve on, HOST:PORT (default 127.0.0.1 on a free port)")
	cmd.Flags().StringVar(&fl.token, "token", "", "access token every request must carry (default $"+tokenEnv+"; made up when serving beyond this machine)")
}

func newServeCommand(a *app) *cobra.Command {
	var fl serveFlags
	cmd := &cobra.Command{
		Use:   "serve [--listen HOST:PORT] [--token TOKEN]",
		Short: "Serve the notebook as web pages on this machine",
		Long: `Serves the notebook as web pages: the overview, the runs with filters,
each run with its scans, the composition and descriptor maps, and forms to
log a melt, amend a value, upload a scan and decide on proposals. It prints
the address to open and serves until Ctrl-C.

By default it listens on 127.0.0.1 on a free port, which only this machine
can reach; no token is needed there. Any other address (--listen
0.0.0.0:8080) is reachable from the network, and every request must then
carry the access token: --token, else $` + tokenEnv + `, else one made up and
put in the printed address. The token travels in clear over plain HTTP, so
serve beyond this machine only on a network you trust.`,
		Args: exactArgs(0, "no arguments"),
		RunE: func(cmd *cobra.Command, _ []string) error {
			st, err := a.openNotebook(cmd.Context())
			if err != nil {
				return err
			}
			defer st.Close()
			return a.serve(cmd.Context(), st, fl)
		},
	}
	fl.register(cmd)
	return cmd
}

// serve serves st until ctx ends, printing the address to open.
func (a *app) serve(ctx context.Context, st *store.Store, fl serveFlags) error {
	token := fl.token
	if token == "" {
		token = os.Getenv(tokenEnv)
	}
	if token != "" && len(token) < 16 {
		return meltbook.Errorf(meltbook.Invalid, "--token", "an access token needs at least 16 characters; this one has %d", len(token))
	}
	srv, err := web.NewServer(web.Config{
		Notebook: st,
		Author:   a.operator(),
		Token:    token,
		Log:      slog.New(slog.NewTextHandler(a.stderr, &slog.HandlerOptions{Level: slog.LevelWarn})),
	})
	if err != nil {
		return err
	}
	// Uploads index their scans; the kept calibration makes that fast.
	a.loadCalibration()
	defer a.saveCalibration()
	url, err := srv.Listen(fl.listen)
	if err != nil {
		return meltbook.Errorf(meltbook.Invalid, "--listen", "cannot serve on %q (write HOST:PORT, e.g. 127.0.0.1:8080): %v", fl.listen, err)
	}
	fmt.Fprintf(a.stdout, "Serving the notebook %s\n", st.Path())
	if srv.Token() != "" {
		fmt.Fprintln(a.stdout, "Every request needs the access token; the address below carries it. Anyone who has it can read and change the notebook.")
	}
	fmt.Fprintf(a.stdout, "open %s in a browser; Ctrl-C stops\n", url)
	<-ctx.Done()
	done, cancel := context.WithTimeout(context.Background(), shutdownGrace)
	defer cancel()
	if err := srv.Shutdown(done); err != nil {
		return fmt.Errorf("stop serving: %w", err)
	}
	fmt.Fprintln(a.stdout, "stopped serving")
	return nil
}
