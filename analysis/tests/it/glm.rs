//! The Poisson GLM against Dobson & Barnett's worked example and statsmodels, with the
//! quasi-Poisson test (t and p) and the negative binomial fit against statsmodels.

use analysis::trend::{Design, TrendError, negative_binomial_glm, poisson_glm};

use crate::assert_close;
use crate::fixtures::{self, FitReference, NegBinReference};

fn design(rows: &[Vec<f64>]) -> Design {
    let names = (0..rows[0].len()).map(|i| format!("x{i}")).collect();
    Design::new(names, rows).unwrap()
}

#[test]
fn british_doctors_example_matches_the_published_fit() {
    // Dobson & Barnett, An Introduction to Generalized Linear Models, British doctors data
    // (the values checked with statsmodels 0.15; the textbook section from memory): terms
    // 1, agecat, agecat², smoke, smoke×agecat; offset log(person-years).
    let data = fixtures::trend().dobson;
    let offsets: Vec<f64> = data.person_years.iter().map(|p| p.ln()).collect();
    let fit = poisson_glm(&design(&data.rows), &data.deaths, &offsets).unwrap();
    let beta = [-10.79176, 2.37648, -0.19768, 1.44097, -0.30755];
    let se = [0.45008, 0.20795, 0.02737, 0.37220, 0.09704];
    for (i, c) in fit.coefficients.iter().enumerate() {
        assert!((c.estimate - beta[i]).abs() < 6e-6, "β{i}: {} vs {}", c.estimate, beta[i]);
        assert!((c.std_error - se[i]).abs() < 6e-6, "SE{i}: {} vs {}", c.std_error, se[i]);
    }
    assert!((fit.deviance - 1.6354).abs() < 6e-5, "deviance {}", fit.deviance);
    assert_eq!(fit.df_residual, 5);
    check_against_statsmodels("dobson", &fit, &data.fit);
}

#[test]
fn general_design_matches_statsmodels_poisson_and_negative_binomial() {
    // Reference: statsmodels GLM(Poisson, offset) and NegativeBinomial(nb2, offset) on
    // make_reference.py's generated overdispersed design.
    let data = fixtures::trend().general_design;
    let d = design(&data.rows);
    let fit = poisson_glm(&d, &data.counts, &data.offsets).unwrap();
    check_against_statsmodels("general design", &fit, &data.fit);
    let nb = negative_binomial_glm(&d, &data.counts, &data.offsets, &fit).unwrap();
    check_negative_binomial("general design", &nb, &data.negative_binomial, &fit);
}

pub fn check_against_statsmodels(name: &str, fit: &analysis::trend::GlmFit, reference: &FitReference) {
    for (i, c) in fit.coefficients.iter().enumerate() {
        assert_close(&format!("{name} β{i}"), c.estimate, reference.params[i], 1e-7);
        assert_close(&format!("{name} SE{i}"), c.std_error, reference.bse[i], 1e-6);
        assert_close(&format!("{name} z{i}"), c.z, reference.z[i], 1e-6);
        // A p-value far in the tail moves by z² times the relative change in z.
        let p_tolerance = 1e-6 * c.z.powi(2).max(1.0);
        assert_close(&format!("{name} p{i}"), c.p_value, reference.p_values[i], p_tolerance);
        // statsmodels GLM(scale="X2", use_t=True): t and p on the residual degrees of freedom,
        // given only for a Pearson dispersion of at least 1 (see `Coefficient::quasi`).
        let dispersion = reference.pearson_chi2 / reference.df_resid as f64;
        let Some(quasi) = c.quasi else {
            assert!(dispersion < 1.0, "{name}: dispersion {dispersion} has a quasi-Poisson test");
            continue;
        };
        assert_close(&format!("{name} scaled SE{i}"), quasi.std_error, reference.bse_scaled_pearson[i], 1e-6);
        assert_close(&format!("{name} t{i}"), quasi.t, reference.t_scaled[i], 1e-6);
        let p_tolerance = 1e-6 * quasi.t.powi(2).max(1.0);
        assert_close(&format!("{name} quasi p{i}"), quasi.p_value, reference.p_values_scaled_t[i], p_tolerance);
    }
    assert_close(&format!("{name} deviance"), fit.deviance, reference.deviance, 1e-7);
    assert_close(&format!("{name} Pearson χ²"), fit.pearson_chi2, reference.pearson_chi2, 1e-6);
    assert_close(&format!("{name} log-likelihood"), fit.log_likelihood, reference.log_likelihood, 1e-9);
    assert_close(&format!("{name} AIC"), fit.aic, reference.aic, 1e-9);
    assert_eq!(fit.df_residual, reference.df_resid, "{name} residual df");
}

pub fn check_negative_binomial(
    name: &str,
    fit: &analysis::trend::NegBinFit,
    reference: &NegBinReference,
    poisson: &analysis::trend::GlmFit,
) {
    let (Some(params), Some(bse)) = (&reference.params, &reference.bse) else {
        // statsmodels' Newton fit did not converge: α runs to 0 and the model is the Poisson
        // model. The reference is then the profile likelihood of statsmodels' GLM negative
        // binomial family over α, whose log-gamma differences at α ≈ 1e-8 keep only five or six
        // decimals (it even rises above the Poisson likelihood by 1e-6, which no α > 0 can);
        // at the boundary the likelihood cannot exceed the Poisson one.
        assert!(fit.at_poisson_boundary, "{name}: α {} ({})", fit.alpha, reference.method);
        assert!((fit.log_likelihood - reference.log_likelihood).abs() < 1e-5, "{name}: {}", fit.log_likelihood);
        assert!(fit.log_likelihood <= poisson.log_likelihood + 1e-9, "{name}: above the Poisson likelihood");
        assert!(fit.aic > poisson.aic, "{name}: the boundary fit never has the lower AIC");
        return;
    };
    assert_close(&format!("{name} NB log-likelihood"), fit.log_likelihood, reference.log_likelihood, 1e-9);
    assert_close(&format!("{name} NB AIC"), fit.aic, reference.aic, 1e-9);
    // Estimates agree to a ten-thousandth of their standard error (near α = 0 the likelihood
    // is flat and both optimisers stop within that), standard errors to 1e-4 relative.
    let alpha_se = reference.alpha_bse.unwrap();
    let within = |what: &str, got: f64, want: f64, se: f64| {
        assert!((got - want).abs() <= 1e-4 * se, "{name} NB {what}: got {got}, expected {want} (SE {se})");
    };
    within("α", fit.alpha, reference.alpha, alpha_se);
    let got_se = fit.alpha_std_error.unwrap_or_else(|| panic!("{name}: α {} has no standard error", fit.alpha));
    assert_close(&format!("{name} NB α SE"), got_se, alpha_se, 1e-4);
    for (i, c) in fit.coefficients.iter().enumerate() {
        within(&format!("β{i}"), c.estimate, params[i], bse[i]);
        assert_close(&format!("{name} NB SE{i}"), c.std_error, bse[i], 1e-4);
    }
}

#[test]
fn bad_inputs_are_refused_with_what_is_wrong() {
    let d = design(&[vec![1.0, 0.0], vec![1.0, 1.0], vec![1.0, 2.0]]);
    let err = poisson_glm(&d, &[1.0, 2.0], &[0.0; 3]).unwrap_err();
    assert_eq!(err.to_string(), "counts has 2 values but there are 3 observations");
    let err = poisson_glm(&d, &[1.0, -2.0, 3.0], &[0.0; 3]).unwrap_err();
    assert_eq!(err.to_string(), "count must be zero or more, got -2 in row 1");
    assert_eq!(poisson_glm(&d, &[0.0; 3], &[0.0; 3]).unwrap_err(), TrendError::AllCountsZero);

    let dependent = Design::new(
        vec!["intercept".into(), "year".into(), "year again".into()],
        &[vec![1.0, 0.0, 0.0], vec![1.0, 1.0, 1.0], vec![1.0, 2.0, 2.0], vec![1.0, 3.0, 3.0]],
    )
    .unwrap();
    let err = poisson_glm(&dependent, &[1.0, 2.0, 3.0, 4.0], &[0.0; 4]).unwrap_err();
    assert_eq!(err.to_string(), "design column 'year again' is a linear combination of the columns before it");

    let err = Design::new(vec!["a".into()], &[vec![1.0], vec![f64::NAN]]).unwrap_err();
    assert_eq!(err.to_string(), "design value in row 1, column 0 is not a finite number");
}
