//! Poisson GLM against Dobson & Barnett's worked example and statsmodels fits.

use analysis::trend::{Design, TrendError, poisson_glm};

use crate::assert_close;
use crate::fixtures::{self, FitReference};

fn design(rows: &[Vec<f64>]) -> Design {
    let names = (0..rows[0].len()).map(|i| format!("x{i}")).collect();
    Design::new(names, rows).unwrap()
}

#[test]
fn british_doctors_example_reproduces_the_published_coefficients() {
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
fn general_design_matches_statsmodels() {
    // Reference: statsmodels GLM(Poisson, offset) on make_reference.py's generated design.
    let data = fixtures::trend().general_design;
    let fit = poisson_glm(&design(&data.rows), &data.counts, &data.offsets).unwrap();
    check_against_statsmodels("general design", &fit, &data.fit);
}

pub fn check_against_statsmodels(name: &str, fit: &analysis::trend::GlmFit, reference: &FitReference) {
    for (i, c) in fit.coefficients.iter().enumerate() {
        assert_close(&format!("{name} β{i}"), c.estimate, reference.params[i], 1e-7);
        assert_close(&format!("{name} SE{i}"), c.std_error, reference.bse[i], 1e-6);
        let scaled = c.quasi_std_error.unwrap();
        assert_close(&format!("{name} scaled SE{i}"), scaled, reference.bse_scaled_pearson[i], 1e-6);
    }
    assert_close(&format!("{name} deviance"), fit.deviance, reference.deviance, 1e-7);
    assert_close(&format!("{name} Pearson χ²"), fit.pearson_chi2, reference.pearson_chi2, 1e-6);
    assert_eq!(fit.df_residual, reference.df_resid, "{name} residual df");
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
