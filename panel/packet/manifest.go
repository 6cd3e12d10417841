package packet

import (
	"encoding/json"
	"fmt"
	"os"
)

// Manifest lists, for the coordinator, what the returns parser must know of
// each packet. It holds codes only; event ids stay in the key.
type Manifest struct {
	Format  string          `json:"format"` // "quorate-manifest"
	Version int             `json:"version"`
	Study   string          `json:"study"`
	Packets []ManifestEntry `json:"packets"`
}

// ManifestEntry describes one rater's packet.
type ManifestEntry struct {
	Packet string   `json:"packet"`
	Rater  string   `json:"rater"`
	Check  string   `json:"check"`
	Items  []string `json:"items"` // codes in the rater's order
	// Phase is the draw phase (2, 3, …) of a packet Extend added for the
	// events a top-up drew; 0 (left out of the file) for the first build.
	Phase int `json:"phase,omitempty"`
}

// ManifestFormat is the format tag of a manifest file.
const ManifestFormat = "quorate-manifest"

// Lookup returns the entry of a packet id.
func (m *Manifest) Lookup(packet string) (*ManifestEntry, bool) {
	for i := range m.Packets {
		if m.Packets[i].Packet == packet {
			return &m.Packets[i], true
		}
	}
	return nil, false
}

// ReadManifest reads a manifest written by Build.
func ReadManifest(path string) (*Manifest, error) {
	b, err := os.ReadFile(path)
	if err != nil {
		return nil, err
	}
	var m Manifest
	if err := json.Unmarshal(b, &m); err != nil {
		return nil, fmt.Errorf("packet: manifest %s: %w", path, err)
	}
	if m.Format != ManifestFormat || m.Version != 1 {
		return nil, fmt.Errorf("packet: manifest %s: format %q version %d, want %q version 1", path, m.Format, m.Version, ManifestFormat)
	}
	return &m, nil
}
