package main

import (
	"fmt"
	"strings"
	"text/tabwriter"

	"fifthline/device"
)

func runDevices(e *env, args []string) error {
	fs := newFlags("devices")
	pos, err := parseFlags(e, fs, args)
	if err != nil {
		return err
	}
	if len(pos) > 0 {
		return usagef("devices takes no arguments (got %q)", pos[0])
	}
	devs, err := device.Devices()
	if err != nil {
		return err
	}
	if len(devs) == 0 {
		fmt.Fprintln(e.stdout, "no audio devices")
		return nil
	}
	tw := tabwriter.NewWriter(e.stdout, 0, 0, 2, ' ', 0)
	fmt.Fprintln(tw, "index\tname\thost API\tin\tout\trate\tdefault")
	for _, d := range devs {
		fmt.Fprintf(tw, "%d\t%s\t%s\t%d\t%d\t%g\t%s\n", d.Index, d.Name, d.HostAPI,
			d.InputChannels, d.OutputChannels, d.DefaultRate, defaultMarks(d))
	}
	if err := tw.Flush(); err != nil {
		return err
	}
	return sayServed(e, devs)
}

// sayServed names the sound server's source behind the inputs it serves:
// PortAudio's 32 channels of "default" say nothing of the microphone. The
// server is asked once: every such input reaches the same source.
func sayServed(e *env, devs []device.Info) error {
	var names []string
	var first device.Info
	for _, d := range devs {
		if device.Serves(d) && d.InputChannels > 0 {
			if names = append(names, d.Name); len(names) == 1 {
				first = d
			}
		}
	}
	src, ok := device.ServedSource(first)
	if len(names) == 0 || !ok {
		return nil
	}
	has := ""
	if src.Channels > 0 {
		has = fmt.Sprintf(", %d channels", src.Channels)
	}
	chosen := "the server's default source"
	if src.ByEnv {
		chosen = "as PULSE_SOURCE names it"
	}
	_, err := fmt.Fprintf(e.stdout, "\n%s: input from %s's source %q%s, %s\n",
		strings.Join(names, ", "), src.Server, src.Words(), has, chosen)
	return err
}

// defaultMarks says in words which system defaults a device is.
func defaultMarks(d device.Info) string {
	var m []string
	if d.DefaultInput {
		m = append(m, "default input")
	}
	if d.DefaultOutput {
		m = append(m, "default output")
	}
	return strings.Join(m, ", ")
}
