// Package ode integrates ordinary differential equations x' = f(x) in
// float64 with the embedded Runge–Kutta pair of Dormand and Prince (1980),
// orders 5 and 4 with seven stages, the last stage reused as the first of
// the next step (first same as last).
//
// A step of size h from x gives the fifth-order solution x⁺ = x + h·Σ bᵢkᵢ
// and, from the same stages, a fourth-order one x̂⁺ = x + h·Σ b̂ᵢkᵢ. Their
// difference estimates the local error of the lower order,
//
//	err = ‖(x⁺ − x̂⁺) / (atol + rtol·max(|x|, |x⁺|))‖_RMS,
//
// a step is accepted when err ≤ 1, and the next step size is
// h·min(5, max(0.2, 0.9·err^(−1/5))) (the usual safety factor and bounds of
// step-size control, Hairer, Nørsett & Wanner, Solving Ordinary
// Differential Equations I, §II.4). The solution carried on is the
// fifth-order one (local extrapolation).
//
// The integrator is for pictures and consistency checks of the engine: it
// proves nothing, and nothing of a certificate rests on it.
package ode
