//! A renewal model stated by its mean interval and shape (for synthetic time scales), rather than
//! fitted to a sample: the same [`Fitted`] type, so a stated model and a fitted one have one set of
//! formulas (mean, density, sampler) and one JSON form.

use super::{Fitted, Model};
use crate::error::{check_positive, Error, Result};
use serde::ser::{Serialize, SerializeMap, Serializer};
use statrs::function::gamma::gamma as gamma_fn;

/// Shape parameter of a stated model when none is given (gamma/Weibull shape, lognormal σ,
/// inverse-Gaussian shape in Myr): an illustrative choice, not a fitted value.
pub const DEFAULT_SHAPE: f64 = 1.5;

impl Model {
    /// The model of a contract name (`exponential`, `gamma`, `weibull`, `lognormal`,
    /// `inverse_gaussian`).
    pub fn from_name(name: &str) -> Result<Model> {
        Model::ALL.into_iter().find(|m| m.name() == name).ok_or_else(|| {
            let names: Vec<_> = Model::ALL.iter().map(|m| m.name()).collect();
            Error::invalid(
                "renewal model",
                name,
                format!("'{name}' is not a renewal model; expected one of {}", names.join(", ")),
            )
        })
    }
}

impl Fitted {
    /// The model `model` with the given mean interval (Myr) and shape parameter.
    ///
    /// `shape` is the family's shape parameter in the contract's terms: gamma and Weibull `shape`
    /// (dimensionless), lognormal `sigma`, inverse-Gaussian `shape` (Myr); it is ignored (and may be
    /// `None`) for the exponential. The scale is chosen so that [`Fitted::mean`] equals `mean`.
    ///
    /// # Formula
    /// exponential rate = 1/mean; gamma scale = mean/k; Weibull scale = mean/Γ(1 + 1/k); lognormal
    /// μ = ln(mean) − σ²/2; inverse Gaussian mean as given.
    ///
    /// # References
    /// Johnson, Kotz & Balakrishnan (1994), *Continuous Univariate Distributions*, vol. 1 (chs. 15,
    /// 17, 19, 21): the means of the families.
    pub fn with_mean(model: Model, mean: f64, shape: Option<f64>) -> Result<Fitted> {
        let mean = check_positive("mean interval", mean)?;
        let need = |s: Option<f64>| -> Result<f64> {
            match s {
                Some(v) => check_positive("shape", v),
                None => {
                    Err(Error::invalid("shape", "none", format!("the {} model needs a shape parameter", model.name())))
                }
            }
        };
        let params = match model {
            Model::Exponential => [1.0 / mean, 0.0],
            Model::Gamma => {
                let k = need(shape)?;
                [k, mean / k]
            }
            Model::Weibull => {
                let k = need(shape)?;
                [k, mean / gamma_fn(1.0 + 1.0 / k)]
            }
            Model::Lognormal => {
                let s = need(shape)?;
                [mean.ln() - 0.5 * s * s, s]
            }
            Model::InverseGaussian => [mean, need(shape)?],
        };
        Ok(Fitted { model, params })
    }

    /// As [`Fitted::with_mean`], with the settings' defaults: a shape is refused for the exponential
    /// model, and the other models take [`DEFAULT_SHAPE`] when none is given.
    pub fn from_settings(model: Model, mean: f64, shape: Option<f64>) -> Result<Fitted> {
        let shape = match (model, shape) {
            (Model::Exponential, Some(_)) => {
                return Err(Error::invalid("shape", "given", "a shape does not apply to the exponential model"))
            }
            (Model::Exponential, None) => None,
            (_, s) => Some(s.unwrap_or(DEFAULT_SHAPE)),
        };
        Self::with_mean(model, mean, shape)
    }

    /// Refuse parameters outside the model's domain (every parameter finite and positive, but the
    /// lognormal μ, which need only be finite), so that a model built by hand samples sensibly.
    pub fn check(&self) -> Result<()> {
        for (name, v) in self.named_params() {
            if name == "mu" {
                if !v.is_finite() {
                    return Err(Error::OutOfRange { name: "mu", value: v, range: "a finite number" });
                }
            } else {
                check_positive(name, v)?;
            }
        }
        Ok(())
    }
}

/// JSON form: the contract name under `model`, then each parameter under its contract name
/// (`{"model": "gamma", "shape": 1.5, "scale": 0.1667}`).
impl Serialize for Fitted {
    fn serialize<S: Serializer>(&self, s: S) -> std::result::Result<S::Ok, S::Error> {
        let named = self.named_params();
        let mut map = s.serialize_map(Some(1 + named.len()))?;
        map.serialize_entry("model", self.model.name())?;
        for (k, v) in named {
            map.serialize_entry(k, &v)?;
        }
        map.end()
    }
}
