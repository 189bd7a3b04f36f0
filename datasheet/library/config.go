package library

import (
	"errors"
	"fmt"
	"io/fs"
	"net/url"
	"strings"

	"gopkg.in/yaml.v3"

	"skysheet/datasheet"
	"skysheet/datasheet/weather"
	"skysheet/spectra"
	"skysheet/spectra/msg"
)

// ConfigFile is the name of the site configuration at the library root.
const ConfigFile = "skysheet.yaml"

// Config is the site configuration read from skysheet.yaml.
type Config struct {
	Title       string // site title; "Material library" when not given
	SiteAddress string // absolute URL the site is published at, ending in "/"; may be empty
	Description string
	AllowHTML   bool // let raw HTML in Markdown bodies through (off by default)
	Lab         string
	Publisher   string
	// Conditions are the library defaults: [datasheet.DefaultConditions]
	// with the config's "conditions:" keys applied.
	Conditions datasheet.Conditions
	// Overrides are the condition keys the config itself sets.
	Overrides Overrides
	// Input is the config file and its SHA-256.
	Input Input
	// files are the sky and weather files the config names, if any.
	files condFiles
}

// condFiles are the files named by conditions: a spectral sky and a
// weather series, nil when not named.
type condFiles struct{ sky, weather *Input }

// configFile is the YAML form of skysheet.yaml.
type configFile struct {
	Title       string    `yaml:"title"`
	SiteAddress string    `yaml:"site_address"`
	Description string    `yaml:"description"`
	AllowHTML   bool      `yaml:"allow_html"`
	Conditions  Overrides `yaml:"conditions"`
	Lab         string    `yaml:"lab"`
	Publisher   string    `yaml:"publisher"`
}

// Overrides holds the condition keys given under "conditions:" in the config
// or in front matter. Keys are those of [datasheet.Conditions] (see
// [datasheet.Conditions.List]: solar_band_nm, temperature_k, ...); keys not
// given keep the value they override.
type Overrides struct {
	node *yaml.Node
}

// UnmarshalYAML keeps the node; it is checked and applied by [Load].
func (o *Overrides) UnmarshalYAML(n *yaml.Node) error {
	o.node = n
	return nil
}

// Keys returns the condition keys set, in the order written.
func (o Overrides) Keys() []string {
	if o.node == nil || o.node.Kind != yaml.MappingNode {
		return nil
	}
	var keys []string
	for i := 0; i+1 < len(o.node.Content); i += 2 {
		keys = append(keys, o.node.Content[i].Value)
	}
	return keys
}

// conditionKeys are the keys of the conditions.
var conditionKeys = func() map[string]bool {
	m := map[string]bool{}
	all := datasheet.DefaultConditions()
	all.Weather.File = "named" // List leaves out a weather series that is not named
	for _, c := range all.List() {
		m[c.Key] = true
	}
	return m
}()

// checkConditions reports unknown and repeated keys under conditions:.
// Values are checked when the conditions are applied.
func (d doc) checkConditions(n *yaml.Node) []error {
	if n.Kind != yaml.MappingNode {
		return nil // apply reports it
	}
	var errs []error
	seen := map[string]*yaml.Node{}
	for i := 0; i+1 < len(n.Content); i += 2 {
		k, v := n.Content[i], n.Content[i+1]
		switch {
		case k.Kind == yaml.AliasNode || v.Kind == yaml.AliasNode:
			errs = append(errs, d.at(k, ErrNotAllowed, "YAML aliases are not used in library files"))
		case k.Value == "<<":
			errs = append(errs, d.at(k, ErrNotAllowed, "YAML merge keys are not used in library files"))
		case seen[k.Value] != nil:
			errs = append(errs, d.at(k, ErrDuplicateKey, "%q (first at line %d)", k.Value, seen[k.Value].Line+d.offset))
		case !conditionKeys[k.Value]:
			errs = append(errs, d.at(k, ErrUnknownKey, "%s", unknownKey(k.Value, sortedKeys(conditionKeys))))
		default:
			seen[k.Value] = k
		}
	}
	return errs
}

// apply returns base with the overrides set, validated. A sky other than
// the built-in one names a spectrum file, and a weather series a series
// file, relative to the document; they are read and their Inputs returned.
func (d doc) apply(o Overrides, base datasheet.Conditions) (datasheet.Conditions, condFiles, error) {
	var files condFiles
	if o.node == nil || o.node.Kind == yaml.ScalarNode && o.node.Tag == "!!null" {
		return base, files, nil
	}
	if o.node.Kind != yaml.MappingNode {
		return base, files, d.at(o.node, ErrType, "conditions: want a mapping such as {temperature_k: 300}, found %s", kindName(o.node))
	}
	c := base // keys were checked with the rest of the document (see check)
	var skyNode, weatherNode *yaml.Node
	for i := 0; i+1 < len(o.node.Content); i += 2 {
		k, v := o.node.Content[i], o.node.Content[i+1]
		if !conditionKeys[k.Value] {
			continue
		}
		var x any
		if err := v.Decode(&x); err != nil {
			return base, files, d.yamlError(err, ErrType)
		}
		if err := c.Set(k.Value, x); err != nil {
			sentinel := ErrConditions
			if errors.Is(err, datasheet.ErrConditionType) {
				sentinel = ErrType
			}
			return base, files, d.at(v, sentinel, "%v", err)
		}
		switch k.Value {
		case "sky":
			skyNode = v
		case "weather":
			weatherNode = v
		}
	}
	if n := weatherNode; n != nil && c.Weather.File != "" {
		at := func(err error) error {
			return &Error{File: d.file, Line: n.Line + d.offset, Column: n.Column, Err: err}
		}
		p, err := resolvePath(d.file, c.Weather.File)
		if err != nil {
			return base, files, at(fmt.Errorf("weather series %s: %w (or write %q for none)", msg.Quote(c.Weather.File), err, datasheet.WeatherChoice{}))
		}
		var s *weather.Series
		if d.fsys != nil {
			s, err = weather.Read(d.fsys, p)
		} else {
			err = fs.ErrNotExist
		}
		var pe *spectra.ParseError
		switch {
		case errors.As(err, &pe):
			// A bad series names its own file, line and column.
			return base, files, &Error{File: pe.File, Line: pe.Line, Column: pe.Column, Err: fmt.Errorf("%w: %w (named at %s:%d)", ErrWeather, pe.Err, d.file, n.Line+d.offset)}
		case err != nil:
			return base, files, at(fmt.Errorf("%w %s: %w (or write %q for none)", ErrWeather, p, unwrapPath(err), datasheet.WeatherChoice{}))
		}
		c.Weather.Series = s
		files.weather = &Input{Path: p, SHA256: s.Input.SHA256}
	}
	if n := skyNode; n != nil && !c.Sky.Clear() {
		p, err := resolvePath(d.file, c.Sky.File)
		if err != nil {
			return base, files, &Error{File: d.file, Line: n.Line + d.offset, Column: n.Column, Err: fmt.Errorf("sky file %s: %w (or write %q for the built-in sky)", msg.Quote(c.Sky.File), err, datasheet.SkyChoice{})}
		}
		var data []byte
		if d.fsys != nil {
			data, err = fs.ReadFile(d.fsys, p)
		} else {
			err = fs.ErrNotExist
		}
		if err != nil {
			return base, files, &Error{File: d.file, Line: n.Line + d.offset, Column: n.Column, Err: fmt.Errorf("%w %s: %w (or write %q for the built-in sky)", ErrSpectrum, p, unwrapPath(err), datasheet.SkyChoice{})}
		}
		s, err := spectra.Decode(data, p)
		if err != nil {
			return base, files, &Error{File: d.file, Line: n.Line + d.offset, Column: n.Column, Err: fmt.Errorf("%w: %w", ErrSpectrum, err)}
		}
		c.Sky.Spectrum = s
		in := hashInput(p, data)
		files.sky = &in
	}
	if err := c.Validate(); err != nil {
		return base, files, d.at(o.node, ErrConditions, "%v", err)
	}
	return c, files, nil
}

// parseConfig reads skysheet.yaml; fsys is the library, for a sky file.
func parseConfig(fsys fs.FS, src []byte) (Config, error) {
	d := doc{file: ConfigFile, fsys: fsys}
	cfg := Config{Title: "Material library", Conditions: datasheet.DefaultConditions(), Input: hashInput(ConfigFile, src)}
	root, err := d.parse(src)
	if err != nil {
		return cfg, err
	}
	var f configFile
	var errs Errors
	usable, err := d.decode(root, &f)
	if err != nil {
		errs = append(errs, err.(Errors)...)
	}
	if !usable {
		return cfg, errs
	}
	if t := strings.TrimSpace(f.Title); t != "" {
		cfg.Title = t
	}
	cfg.Description, cfg.AllowHTML = strings.TrimSpace(f.Description), f.AllowHTML
	cfg.Lab, cfg.Publisher = strings.TrimSpace(f.Lab), strings.TrimSpace(f.Publisher)
	if b := strings.TrimSpace(f.SiteAddress); b != "" {
		u, err := url.Parse(b)
		if err != nil || (u.Scheme != "http" && u.Scheme != "https") || u.Host == "" {
			errs = append(errs, d.at(valueNode(root, "site_address"), ErrType, "site_address %s: want an absolute http or https URL", msg.Quote(b)))
		} else {
			cfg.SiteAddress = strings.TrimSuffix(u.String(), "/") + "/"
		}
	}
	cfg.Overrides = f.Conditions
	c, sky, err := d.apply(f.Conditions, cfg.Conditions)
	if err != nil {
		errs = append(errs, err)
	}
	cfg.Conditions, cfg.files = c, sky
	if len(errs) > 0 {
		return cfg, errs
	}
	return cfg, nil
}

// valueNode returns the value node of key in mapping m, or m itself when
// the key is absent.
func valueNode(m *yaml.Node, key string) *yaml.Node {
	for i := 0; i+1 < len(m.Content); i += 2 {
		if m.Content[i].Value == key {
			return m.Content[i+1]
		}
	}
	return m
}
