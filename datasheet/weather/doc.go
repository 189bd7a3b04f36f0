// Package weather reads hourly weather series and holds the small published
// correlations that turn a weather hour into the conditions of the cooling
// model.
//
// # The series
//
// A series is a CSV file of this project's own design (docs/format.md,
// "Hourly weather series"): a header naming each column in words with its
// unit in parentheses — time, air temperature, dew point and global
// horizontal irradiance are required; wind speed, cloud fraction and station
// pressure are optional — then one row per hour. [Parse] checks everything
// and returns a [Series] whose rows follow each other by exactly one hour.
//
// # Units inside the program
//
// Readers convert at the edge; a [Hour] holds temperatures in °C (the dew
// point correlation and the conditions of the cooling figures take °C for the
// dew point; add 273.15 for kelvin), irradiance in W/m², wind speed in m/s,
// cloud fraction as a fraction 0..1 and station pressure in hPa. An optional
// quantity the series does not have is NaN in every hour; [Series.Has] says
// which are present.
//
// # Errors
//
// Bad input never panics: [Parse] returns a *[spectra.ParseError] naming the
// file, line and column (and the column's header) and wrapping one of the
// errors of this package, so callers test it with [errors.Is].
//
// # Correlations
//
// [ConvectiveH] (non-radiative heat-transfer coefficient from wind speed),
// [CloudySkyEmissivity] (cloud correction of a clear-sky emissivity), and
// [HourTerm] and [PressureTerm] (the optional terms of the Berdahl–Martin
// clear-sky correlation) are pure functions; each doc comment names its
// source and range.
package weather
