//! Thermal networks advanced exactly over a step with losses frozen (engine.md §5):
//! a two-node winding/stator network for sized motors and one node for datasheet motors.

/// Two-node network: C_w·dθ_w/dt = P_w − G_ws(θ_w − θ_s);
/// C_s·dθ_s/dt = P_s + G_ws(θ_w − θ_s) − G_sc(θ_s − θ_sink).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct TwoNode {
    /// J/K
    pub c_winding: f64,
    pub c_stator: f64,
    /// W/K
    pub g_ws: f64,
    pub g_sc: f64,
}

/// The exact propagator e^{AΔt} of the homogeneous part for one step length.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Propagator {
    pub m: [[f64; 2]; 2],
}

impl TwoNode {
    /// System matrix A of x' = A·x + b, x = (θ_w, θ_s).
    pub fn matrix(&self) -> [[f64; 2]; 2] {
        [
            [-self.g_ws / self.c_winding, self.g_ws / self.c_winding],
            [
                self.g_ws / self.c_stator,
                -(self.g_ws + self.g_sc) / self.c_stator,
            ],
        ]
    }

    /// e^{A·dt} by the closed form for 2×2 matrices with real distinct eigenvalues
    /// (the RC network is similar to a symmetric negative-definite matrix).
    pub fn propagator(&self, dt_s: f64) -> Propagator {
        Propagator {
            m: expm2(self.matrix(), dt_s),
        }
    }

    /// Steady state for frozen losses and sink.
    pub fn equilibrium(&self, p_winding_w: f64, p_stator_w: f64, sink_c: f64) -> (f64, f64) {
        let stator = sink_c + (p_winding_w + p_stator_w) / self.g_sc;
        (stator + p_winding_w / self.g_ws, stator)
    }

    /// Advances (θ_w, θ_s) exactly over one step with the given propagator.
    pub fn step(
        &self,
        prop: &Propagator,
        state: (f64, f64),
        p_winding_w: f64,
        p_stator_w: f64,
        sink_c: f64,
    ) -> (f64, f64) {
        let (ew, es) = self.equilibrium(p_winding_w, p_stator_w, sink_c);
        let (dw, ds) = (state.0 - ew, state.1 - es);
        (
            ew + prop.m[0][0] * dw + prop.m[0][1] * ds,
            es + prop.m[1][0] * dw + prop.m[1][1] * ds,
        )
    }
}

/// Matrix exponential of a 2×2 matrix times dt: e^{sΔ}[cosh(qΔ)·I + sinh(qΔ)/q·(A − sI)],
/// s = tr/2, q = √(s² − det). Falls back to the q → 0 limit for (near-)repeated roots.
pub fn expm2(a: [[f64; 2]; 2], dt: f64) -> [[f64; 2]; 2] {
    let s = 0.5 * (a[0][0] + a[1][1]);
    let det = a[0][0] * a[1][1] - a[0][1] * a[1][0];
    let disc = (s * s - det).max(0.0);
    let q = disc.sqrt();
    let es = (s * dt).exp();
    let qdt = q * dt;
    let (ch, sh_over_q) = if qdt < 1e-6 {
        (1.0 + 0.5 * qdt * qdt, dt * (1.0 + qdt * qdt / 6.0))
    } else {
        // cosh and sinh written with exponentials of negative arguments only, so that large
        // qΔt cannot overflow: e^{sΔ}·cosh(qΔ) = ½(e^{(s+q)Δ} + e^{(s−q)Δ}).
        let ep = ((s + q) * dt).exp();
        let em = ((s - q) * dt).exp();
        let c = 0.5 * (ep + em);
        let sh = 0.5 * (ep - em) / q;
        return [
            [c + sh * (a[0][0] - s), sh * a[0][1]],
            [sh * a[1][0], c + sh * (a[1][1] - s)],
        ];
    };
    [
        [
            es * (ch + sh_over_q * (a[0][0] - s)),
            es * sh_over_q * a[0][1],
        ],
        [
            es * sh_over_q * a[1][0],
            es * (ch + sh_over_q * (a[1][1] - s)),
        ],
    ]
}

/// One-node network: C·dθ/dt = P − (θ − θ_sink)/R.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct OneNode {
    /// K/W
    pub resistance: f64,
    /// J/K
    pub capacitance: f64,
}

impl OneNode {
    pub fn decay(&self, dt_s: f64) -> f64 {
        (-dt_s / (self.resistance * self.capacitance)).exp()
    }

    pub fn step(&self, decay: f64, theta: f64, p_w: f64, sink_c: f64) -> f64 {
        let eq = sink_c + p_w * self.resistance;
        eq + (theta - eq) * decay
    }
}
