//! How complete a measured level list is for thermodynamics: its sums
//! against a model's full spectrum over a temperature grid.
