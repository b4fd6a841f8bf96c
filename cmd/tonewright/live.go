package main

import (
	"fmt"
	"net"
	"os"
	"os/signal"
	"path/filepath"
	"strconv"
	"strings"
	"syscall"

	"github.com/spf13/cobra"

	"tonewright/cmd/tonewright/live"
	"tonewright/networks"
)

func init() { register(newLiveCmd) }

// liveRenderer plays designs on the live page (live_audio.go).
var liveRenderer live.Renderer = pageRenderer{}

func newLiveCmd(a *app) *cobra.Command {
	var compare, addr, saveAs string
	var port int
	c := &cobra.Command{
		Use:   "live DESIGN.yaml",
		Short: "Voice a design on a local page: knobs as sliders, parts as fields, the curve redrawn at once",
		Long: `live starts a local web server and prints its address. Its one page shows
the curve at the current knob setting (the knob's ends faint behind it, the
saved design dashed, a --compare design overlaid), a slider for every knob,
every part as a field in the trade's notation with steps through E12, E24 or
E96, the figures analyze reports, and buttons to play and to save.

Save writes the design file back (or the --save-as file), keeping the
previous version as NAME.yaml.bak. The server binds 127.0.0.1 unless --addr
says otherwise, answers only requests addressed to it, and writes no other
file. Stop it with Ctrl-C.`,
		Example: `  tonewright live board.yaml
  tonewright live board.yaml --compare other.yaml --port 8650
  tonewright live board.yaml --save-as board-voiced.yaml`,
		Args:              exactArgs(1, "DESIGN.yaml"),
		ValidArgsFunction: yamlFiles,
		RunE: func(cmd *cobra.Command, args []string) error {
			if port < 0 || port > 65535 {
				return usageErrorf("--port %d: use 0 (any free port) to 65535", port)
			}
			ip := net.ParseIP(addr)
			if ip == nil {
				return usageErrorf("--addr %q: give an IP address such as 127.0.0.1", addr)
			}
			m, err := liveModel(args[0])
			if err != nil {
				return err
			}
			cfg := live.Config{Design: m, SavePath: args[0], Renderer: liveRenderer}
			if saveAs != "" {
				if err := checkOutput(saveAs, compare); err != nil {
					return err
				}
				cfg.SavePath = saveAs
			}
			if compare != "" {
				if cfg.Compare, err = liveModel(compare); err != nil {
					return err
				}
			}
			if !ip.IsLoopback() {
				fmt.Fprintf(a.err, "warning: --addr %s: the page is reachable from other machines on this network, and anyone who reaches it can change and save %s\n", addr, cfg.SavePath)
			}
			ln, err := net.Listen("tcp", net.JoinHostPort(addr, strconv.Itoa(port)))
			if err != nil {
				return badInput(fmt.Errorf("cannot listen on %s port %d: %w", addr, port, err))
			}
			srv, err := live.New(cfg, ln.Addr().String())
			if err != nil {
				ln.Close()
				return err
			}
			ctx, stop := signal.NotifyContext(cmd.Context(), os.Interrupt, syscall.SIGTERM)
			defer stop()
			shown := ln.Addr().String()
			if ip.IsUnspecified() {
				_, p, _ := net.SplitHostPort(shown)
				shown = net.JoinHostPort("127.0.0.1", p) + "/ and this machine's other IP addresses, port " + p
			} else {
				shown += "/"
			}
			fmt.Fprintf(a.out, "tonewright live: http://%s (saving to %s; Ctrl-C stops)\n", shown, cfg.SavePath)
			if err := srv.Serve(ctx, ln); err != nil && !strings.Contains(err.Error(), "Server closed") {
				return err
			}
			fmt.Fprintln(a.out, "tonewright live: stopped")
			return nil
		},
	}
	c.Flags().StringVar(&compare, "compare", "", "overlay the curve of another design `FILE` at the same knobs")
	c.Flags().IntVar(&port, "port", 0, "port to listen on (0: any free port)")
	c.Flags().StringVar(&addr, "addr", "127.0.0.1", "IP address to bind; anything but a loopback address is reachable from other machines")
	c.Flags().StringVar(&saveAs, "save-as", "", "save to `FILE` instead of the design file")
	return c
}

// liveModel loads a design file for the live page; a design without a
// name is shown by its file's name (the file is saved without one).
func liveModel(path string) (live.Model, error) {
	d, err := networks.LoadDesign(path)
	if err != nil {
		return nil, badInput(err)
	}
	m, err := live.NewDesignModel(d, strings.TrimSuffix(filepath.Base(path), filepath.Ext(path)))
	if err != nil {
		return nil, badInput(err)
	}
	return m, nil
}
