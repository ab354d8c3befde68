package fuse

// The result document, format liftfuse.result/1 (result-format.md). Fields
// may be added; none may be renamed or removed without a new format number.

// ResultFormat is the format string of the result document.
const ResultFormat = "liftfuse.result/1"

// Result is the result document of `fuse --json` and `report --json`.
type Result struct {
	Format      string          `json:"format"`
	ToolVersion string          `json:"tool_version"`
	Campaign    CampaignInfo    `json:"campaign"`
	Credible    float64         `json:"credible"`
	Air         AirInfo         `json:"air"`
	Configs     []ConfigResult  `json:"configs"`
	Deltas      []DeltaResult   `json:"deltas"`
	Methods     []MethodResult  `json:"methods"`
	Warnings    []string        `json:"warnings"`
	Diagnostics *DiagnosticsDoc `json:"diagnostics,omitempty"`

	// Headline says which fusion Configs and Deltas are: HeadlinePlain,
	// or HeadlineRobust when some entry looks off (P(off) > 0.5) and the
	// robust fusion, with that entry's errors widened by κ, is reported.
	Headline string `json:"headline"`
	// DownWeighted names the entries whose errors the robust fusion
	// widened (empty with a plain headline).
	DownWeighted []string `json:"down_weighted"`
	// Plain holds the plain fusion's figures when the headline is robust.
	Plain *PlainFusion `json:"plain,omitempty"`
	// Checks are the tripped model checks, each also one line of Warnings.
	Checks []Check `json:"checks"`
}

// Headline values of Result.Headline.
const (
	HeadlinePlain  = "plain"
	HeadlineRobust = "robust"
)

// PlainFusion is the plain fusion's configurations and deltas, kept beside
// a robust headline so that a reader can see what the down-weighting moved.
type PlainFusion struct {
	Configs []ConfigResult `json:"configs"`
	Deltas  []DeltaResult  `json:"deltas"`
}

// CampaignInfo names the campaign and fingerprints its inputs.
type CampaignInfo struct {
	Title  string `json:"title"`
	SHA256 string `json:"sha256"`
}

// AirInfo says how dense the air was and how that was computed.
type AirInfo struct {
	DensityKgM3 float64 `json:"density_kg_m3"`
	Method      string  `json:"method"`
}

// AxleResult is the posterior of one axle (or the total).
type AxleResult struct {
	CLA        Estimate `json:"cla_m2"`
	PDownforce float64  `json:"p_downforce"`
}

// ConfigResult is the fused result of one configuration.
type ConfigResult struct {
	ID         string        `json:"id"`
	Front      AxleResult    `json:"front"`
	Rear       AxleResult    `json:"rear"`
	Total      AxleResult    `json:"total"`
	FrontShare Estimate      `json:"front_share"`
	AtSpeeds   []SpeedResult `json:"at_speeds"`
	// SAE holds the SAE J1594 coefficients C_LF, C_LR, C_L when the
	// campaign gives a frontal area.
	SAE *SAECoefficients `json:"sae,omitempty"`
	// PriorOnly is true when no evidence speaks of this configuration.
	PriorOnly bool `json:"prior_only,omitempty"`
}

// SAECoefficients are C_LF = β_f/A, C_LR = β_r/A and C_L = β_t/A.
type SAECoefficients struct {
	FrontalAreaM2 float64  `json:"frontal_area_m2"`
	CLF           Estimate `json:"c_lf"`
	CLR           Estimate `json:"c_lr"`
	CL            Estimate `json:"c_l"`
}

// SpeedResult holds axle forces at a report speed, in newtons, and
// P(downforce) there. With the linear speed model every figure uses β(V) at
// that speed, β(V) = β + γ·(V − V_ref)/V_ref: the force is q(V)·β(V) and
// P(downforce) = P(β(V) < 0), which may differ from the configuration's
// P(downforce) at V_ref.
type SpeedResult struct {
	SpeedKmh   float64   `json:"speed_kmh"`
	FrontN     Estimate  `json:"front_n"`
	RearN      Estimate  `json:"rear_n"`
	TotalN     Estimate  `json:"total_n"`
	PDownforce AxleProbs `json:"p_downforce"`
}

// AxleProbs is a probability per axle and for the total.
type AxleProbs struct {
	Front float64 `json:"front"`
	Rear  float64 `json:"rear"`
	Total float64 `json:"total"`
}

// DeltaResult is a configuration's difference to the reference one.
type DeltaResult struct {
	Config string     `json:"config"`
	Versus string     `json:"versus"`
	Front  AxleResult `json:"front"`
	Rear   AxleResult `json:"rear"`
	Total  AxleResult `json:"total"`
}

// MethodResult is what one evidence entry says and how well it agrees.
type MethodResult struct {
	ID         string             `json:"id"`
	Kind       string             `json:"kind"`
	Standalone []StandaloneResult `json:"standalone"`
	Agreement  *Agreement         `json:"agreement"`
}

// StandaloneResult is one quantity as one entry alone says it.
type StandaloneResult struct {
	Config     string   `json:"config"`
	Axle       string   `json:"axle"`
	CLA        Estimate `json:"cla_m2"`
	PDownforce float64  `json:"p_downforce"`
}

// Agreement compares an entry with all the others by the leave-one-out
// predictive of its data (predictive.go): the errors it shares with the
// others (springs, wind, pitch of drag, probe) are counted once. Distance
// is √d², d² = tᵀV⁻¹t with t what the entry's data say of the quantities
// it informs minus what the others predict they would say; PValue is
// P(χ²_r > d²), r the rank of V (for sign evidence, the posterior
// predictive p-value of the observed senses, and Distance its two-sided
// normal quantile). POff is the posterior probability that its errors are
// inflated by κ, computed as a sequential diagnosis (robust.go). Flag is
// PValue < 0.05 or POff > 0.5 (result-format.md); Suspect, the level at
// which the tool names the entry, warns, down-weights and explains it, is
// PValue < 0.01 or POff > 0.5.
type Agreement struct {
	Distance float64 `json:"distance"`
	PValue   float64 `json:"p_value"`
	POff     float64 `json:"p_off"`
	Flag     bool    `json:"flag"`
	Suspect  bool    `json:"suspect"`
	// Worst names the quantity where the entry disagrees most, with the
	// difference (what its data say minus what the others predict) in m²
	// and in standard deviations of the prediction.
	Worst *Disagreement `json:"worst,omitempty"`
	Note  string        `json:"note,omitempty"`
}

// Disagreement is the largest single difference of an entry.
type Disagreement struct {
	Config string  `json:"config"`
	Axle   string  `json:"axle"`
	DiffM2 float64 `json:"diff_m2"`
	Sigmas float64 `json:"sigmas"`
}

// DiagnosticsDoc reports how the fused posterior was computed. RhatMax and
// ESSMin are null for a closed-form posterior.
type DiagnosticsDoc struct {
	Sampler string   `json:"sampler"`
	Draws   int      `json:"draws"`
	Seed    uint64   `json:"seed"`
	RhatMax *float64 `json:"rhat_max"`
	ESSMin  *float64 `json:"ess_min"`
}
