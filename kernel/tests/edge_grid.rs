//! Refused inputs of the heat step and the grid pricer: a typed error naming
//! the field or parameter, never a panic.

use calor::{
    american_price, grid_value, Contract, Error, Field, GridParameter, GridSpec, HeatGrid, Kind,
    Market, ThetaScheme,
};

const PUT: Contract = Contract {
    kind: Kind::Put,
    strike: 100.0,
    expiry: 1.0,
};
const NGX: Market = Market {
    spot: 100.0,
    rate: 0.05,
    dividend_yield: 0.01,
};

fn bad(parameter: GridParameter) -> Result<calor::GridValue, Error> {
    Err(Error::InvalidGrid { parameter })
}

fn with_spec(spec: GridSpec) -> Result<calor::GridValue, Error> {
    let mut workspace = vec![0.0; 10_000];
    grid_value(&PUT, &NGX, 0.2, &spec, &mut workspace)
}

#[test]
fn edge_market_not_finite() {
    let m = Market {
        spot: f64::NAN,
        ..NGX
    };
    assert_eq!(
        american_price(&PUT, &m, 0.2),
        Err(Error::NotFinite { field: Field::Spot })
    );
    let m = Market {
        rate: f64::INFINITY,
        ..NGX
    };
    assert_eq!(
        american_price(&PUT, &m, 0.2),
        Err(Error::NotFinite { field: Field::Rate })
    );
    assert_eq!(
        american_price(&PUT, &NGX, f64::NAN),
        Err(Error::NotFinite { field: Field::Vol })
    );
}

#[test]
fn edge_expiry_zero() {
    let c = Contract { expiry: 0.0, ..PUT };
    assert_eq!(
        american_price(&c, &NGX, 0.2),
        Err(Error::NotPositive {
            field: Field::Expiry
        })
    );
    let c = Contract {
        expiry: -1.0,
        ..PUT
    };
    assert_eq!(
        american_price(&c, &NGX, 0.2),
        Err(Error::Negative {
            field: Field::Expiry
        })
    );
}

#[test]
fn edge_vol_zero() {
    assert_eq!(
        american_price(&PUT, &NGX, 0.0),
        Err(Error::NotPositive { field: Field::Vol })
    );
}

#[test]
fn edge_strike_not_positive() {
    let c = Contract { strike: 0.0, ..PUT };
    assert_eq!(
        american_price(&c, &NGX, 0.2),
        Err(Error::NotPositive {
            field: Field::Strike
        })
    );
}

#[test]
fn edge_grid_spec_out_of_range() {
    let base = GridSpec::AMERICAN;
    assert_eq!(
        with_spec(GridSpec { nodes: 4, ..base }),
        bad(GridParameter::Nodes)
    );
    assert_eq!(
        with_spec(GridSpec { steps: 0, ..base }),
        bad(GridParameter::Steps)
    );
    assert_eq!(
        with_spec(GridSpec {
            theta: f64::NAN,
            ..base
        }),
        bad(GridParameter::Theta)
    );
    assert_eq!(
        with_spec(GridSpec { theta: 1.5, ..base }),
        bad(GridParameter::Theta)
    );
    assert_eq!(
        with_spec(GridSpec {
            rannacher_steps: 61,
            ..base
        }),
        bad(GridParameter::RannacherSteps)
    );
    assert_eq!(
        with_spec(GridSpec { width: 0.5, ..base }),
        bad(GridParameter::Width)
    );
    assert_eq!(
        with_spec(GridSpec {
            width: f64::NAN,
            ..base
        }),
        bad(GridParameter::Width)
    );
    assert_eq!(
        with_spec(GridSpec {
            grading: 0.0,
            ..base
        }),
        bad(GridParameter::Grading)
    );
    let huge = GridSpec {
        nodes: usize::MAX,
        ..base
    };
    assert_eq!(with_spec(huge), bad(GridParameter::Nodes));
}

#[test]
fn edge_grid_workspace_too_short() {
    let spec = GridSpec::AMERICAN;
    let needed = spec.workspace_len().expect("a size");
    let mut workspace = vec![0.0; needed - 1];
    assert_eq!(
        grid_value(&PUT, &NGX, 0.2, &spec, &mut workspace),
        bad(GridParameter::Workspace)
    );
}

#[test]
fn edge_grid_explicit_scheme_unstable() {
    // θ = 0 on the default grid: μ is far above ½.
    let spec = GridSpec {
        theta: 0.0,
        rannacher_steps: 0,
        ..GridSpec::AMERICAN
    };
    assert_eq!(with_spec(spec), Err(Error::UnstableStep));
}

#[test]
fn edge_heat_scheme_parameters() {
    let invalid = |parameter| Err(Error::InvalidGrid { parameter });
    assert_eq!(
        ThetaScheme::new(-0.1, 1.0, 0.1, 0.1),
        invalid(GridParameter::Theta)
    );
    assert_eq!(
        ThetaScheme::new(0.5, 0.0, 0.1, 0.1),
        invalid(GridParameter::Kappa)
    );
    assert_eq!(
        ThetaScheme::new(0.5, 1.0, f64::NAN, 0.1),
        invalid(GridParameter::TimeStep)
    );
    assert_eq!(
        ThetaScheme::new(0.5, 1.0, 0.1, -0.1),
        invalid(GridParameter::SpaceStep)
    );
    assert_eq!(
        ThetaScheme::new(0.5, 1.0, 1e300, 1e-300),
        invalid(GridParameter::MeshRatio)
    );
}

#[test]
fn edge_heat_step_sizes_and_boundaries() {
    let scheme = ThetaScheme::new(0.5, 1.0, 0.01, 0.1).expect("a scheme");
    let invalid = |parameter| Err(Error::InvalidGrid { parameter });
    let (mut u, mut scratch) = ([0.0; 2], [0.0; 2]);
    assert_eq!(
        scheme.step(&mut u, &mut scratch, 0.0, 0.0),
        invalid(GridParameter::Nodes)
    );
    let mut u = [0.0; 5];
    assert_eq!(
        scheme.step(&mut u, &mut scratch, 0.0, 0.0),
        invalid(GridParameter::Workspace)
    );
    let mut scratch = [0.0; 3];
    assert_eq!(
        scheme.step(&mut u, &mut scratch, f64::NAN, 0.0),
        invalid(GridParameter::Boundary)
    );
    let factored = scheme.factor(&mut scratch).expect("pivots");
    let mut wrong = [0.0; 6];
    assert_eq!(
        factored.step(&mut wrong, 0.0, 0.0),
        invalid(GridParameter::Nodes)
    );
    assert_eq!(
        scheme.factor(&mut []).map(|_| ()),
        invalid(GridParameter::Nodes)
    );
    let mut grid = HeatGrid::new([0.0; 3]);
    assert_eq!(
        grid.step(&scheme, 0.0, f64::INFINITY),
        invalid(GridParameter::Boundary)
    );
}

#[test]
fn edge_errors_name_the_parameter() {
    let e = Error::InvalidGrid {
        parameter: GridParameter::RannacherSteps,
    };
    assert!(e.to_string().starts_with("rannacher_steps: "), "{e}");
    assert!(Error::UnstableStep.to_string().starts_with("mesh_ratio: "));
    let e = Error::InvalidGrid {
        parameter: GridParameter::Workspace,
    };
    assert!(e.to_string().starts_with("workspace: "), "{e}");
}

#[test]
fn edge_far_from_the_strike_still_values() {
    // Spot 20 σ√T out of the money: the domain stretches and the value is ~0.
    let m = Market { spot: 300.0, ..NGX };
    let v = american_price(&PUT, &m, 0.05).expect("a value");
    assert!(v.abs() < 1e-12, "{v}");
    // Deep in the money the put is exercised at once.
    let m = Market { spot: 20.0, ..NGX };
    assert_eq!(american_price(&PUT, &m, 0.05), Ok(80.0));
}
