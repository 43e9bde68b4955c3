// Package geometry describes the bodies inside the container in lattice
// units: spheres centred on the axis, the mask of nodes each body covers,
// the boundary links from fluid nodes into a body with their exact wall
// distances, and the nodes a moving body covers and uncovers.
//
// Coordinates are those of the lattice: node (k, j) sits at
// z = k + 1/2, r = j + 1/2, with the container's left end at z = 0, its
// side wall at r = Nr and the axis at r = 0. A sphere centred on the axis
// is a disk in the meridian plane; its part below the axis is the mirror
// image that links from row 0 can reach.
package geometry
