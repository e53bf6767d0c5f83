// Package page writes report.html: one self-contained page for a run or a
// study folder, with its tables, its plots and pictures as data URIs, the
// safety caution, and, where the folder holds animation.glb, the motion
// played in the page by a small embedded player (player.js) that needs no
// network, no WebGL and no GPU.
package page
