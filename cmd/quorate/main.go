// Command quorate takes an epilepsy EEG team from an EDF/EDF+/BDF archive to a locally
// tuned operating point for detecting interictal epileptiform discharges. This package is
// wiring only: flags become an Options struct handed to a Run function in a domain package.
package main

import "os"

func main() {
	os.Exit(execute(os.Args[1:]))
}
