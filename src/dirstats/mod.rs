//! Directions that are not Fisherian: elliptical confidence regions (Kent 1982, bootstrap of Tauxe et
//! al. 1991), a statistical field model (TK03), the elongation/inclination correction of inclination
//! shallowing (Tauxe & Kent 2004), and the latitude dependence of VGP scatter (McFadden et al. 1988).

mod bootstrap_ellipse;
mod elongation;
mod group_ellipses;
mod kent;
mod legendre;
mod psv_groups;
mod psv_model;
mod shallowing;
mod tk03;
mod unflatten;

pub use bootstrap_ellipse::{bootstrap_ellipse, BootstrapKind};
pub use elongation::{elongation_of, tk03_curve, Elongation};
pub use group_ellipses::{group_ellipses, EllipseMethod, GroupEllipses};
pub use kent::{chi2_2_quantile, kent_ellipse, KentEllipse};
pub use legendre::{schmidt_legendre, SchmidtTable};
pub use psv_groups::{psv_groups, psv_model, GroupRemark, PsvGroups, MIN_GROUP_SITES};
pub use psv_model::{
    fit_latitude_model, group_paleolatitude, group_pole, latitude_model_bootstrap, LatitudeFit, LatitudeGroup,
    LatitudeModelInterval,
};
pub use shallowing::{shallowing_directions, unflatten_given, ShallowingInput};
pub use tk03::{field_direction, Tk03};
pub use unflatten::{
    apply_factor, unflatten_factor, unflatten_inclination, unflatten_search, EiCurve, FactorResult, UnflattenResult,
    MIN_DIRECTIONS, RECOMMENDED_DIRECTIONS,
};

#[cfg(test)]
mod tests;
