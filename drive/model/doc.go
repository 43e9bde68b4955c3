// Package model holds the reduced models set beside a simulation: the
// linear unsteady-Stokes model of the spheres, springs and arms in the
// shaken frame (Linear), and the steady-Stokes chain model of swimming
// speeds (StokesChain, ThreeSphereSpeed). They need only the case.
package model
