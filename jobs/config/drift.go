package config

// Drift sets when a headline metric's change since the previous run is
// flagged: when |z| >= ZThreshold, z being the change over the sample
// standard deviation of the portfolio's earlier changes, once at least
// MinHistory earlier changes exist.
type Drift struct {
	ZThreshold float64 `toml:"z_threshold" json:"z_threshold"`
	MinHistory int     `toml:"min_history" json:"min_history"`
}

func (c *Config) validateDrift() Errors {
	var es Errors
	if !(c.Drift.ZThreshold > 0) {
		es = append(es, c.errAt("drift.z_threshold", "%v must be positive", c.Drift.ZThreshold))
	}
	if c.Drift.MinHistory < 2 {
		es = append(es, c.errAt("drift.min_history", "%d is below 2", c.Drift.MinHistory))
	}
	return es
}
